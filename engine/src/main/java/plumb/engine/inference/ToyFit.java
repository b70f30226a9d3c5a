package plumb.engine.inference;

import plumb.engine.minimise.MinimumStatus;

/**
 * The outcome of fitting one toy data set: all a summary or a merge of batches needs, nothing
 * more (a campaign keeps one per toy, so it is kept small).
 *
 * @param index          the toy's number in its run (its random stream is fixed by the seed and this)
 * @param status         how the toy's fit ended
 * @param poi            fitted POI value (NaN when the fit failed)
 * @param poiError       the POI's symmetric error from the inverse Hessian (NaN when unavailable)
 * @param nuisancePulls  (θ̂ − θ_gen)/σ̂ of each tracked nuisance ({@link InjectionToys#pulledParameters()}),
 *                       NaN where the error is unavailable
 */
public record ToyFit(long index, MinimumStatus status, double poi, double poiError, double[] nuisancePulls)
        implements java.io.Serializable {

    /** True when the fit converged with a usable POI error: only such toys enter the statistics. */
    public boolean usable() {
        return status.isMinimum() && poiError > 0 && poiError < Double.POSITIVE_INFINITY
                && Double.isFinite(poi);
    }

    /** Rough heap bytes of one result with {@code pulls} nuisance pulls (record, boxed header, array). */
    public static long estimatedBytes(int pulls) {
        return 96 + 16 + 8L * pulls;
    }
}
