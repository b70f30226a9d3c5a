package plumb.engine.inference;

/**
 * The Asimov closure check of one injected value: the fit to the Asimov data set and how far it
 * landed from the point the data set was made at.
 *
 * @param injected      the POI value of the Asimov data set
 * @param generating    the generating point (nAll)
 * @param fit           the fit to the Asimov data set (from the nominal values)
 * @param maxDeviation  largest |fitted − generating| over the parameters not held (NaN if a value is NaN)
 * @param worstParameter index of that parameter, −1 when every parameter is held
 * @param passed        the fit converged and maxDeviation ≤ {@link InjectionToys#CLOSURE_TOLERANCE}
 */
public record AsimovClosure(double injected, double[] generating, FitResult fit, double maxDeviation,
                            int worstParameter, boolean passed) {
}
