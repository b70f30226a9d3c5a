package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;

import java.util.Arrays;

/** Data sets made from the model itself (docs/model-format.md, "Generated data sets"). */
public final class DataSets {

    private DataSets() {
    }

    /**
     * The Asimov data set at the parameter values {@code values} (nAll, γ included): every bin,
     * blinded ones included, set to its expectation, and every auxiliary value to its generating
     * value (Gaussian centre = θ, Poisson m = τγ). Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554.
     */
    public static DataSet asimov(CompiledModel m, double[] values) {
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        double[] counts = expectedCounts(m, values);
        double[] aux = generatingAux(m, values);
        return DataSet.of(m, "asimov", counts, all, aux);
    }

    /**
     * The Asimov data set at POI value {@code poiValue}, as the format page defines it: with
     * {@code postfit} and observed data in some channel, the nuisance values are those of a fit to
     * the observed data with the POI and the {@code held} parameters held; otherwise the nominal
     * values (held parameters at their values). The conditional fit is returned with the data
     * (null for pre-fit Asimov) so callers can report a fit that did not converge.
     */
    public static Generated asimovAt(CompiledModel m, double poiValue, int[] held, double[] heldValues,
                                     boolean postfit, FitSettings settings) {
        if (m.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        int[] hold = Arrays.copyOf(held, held.length + 1);
        double[] holdValues = Arrays.copyOf(heldValues, heldValues.length + 1);
        hold[held.length] = m.poi();
        holdValues[held.length] = poiValue;
        double[] values = m.nominal();
        for (int k = 0; k < hold.length; k++) values[hold[k]] = holdValues[k];
        FitResult conditional = null;
        DataSet observed = DataSet.observed(m);
        if (postfit && observed.anyChannel()) {
            Fitter fitter = Fitter.valuesOnly(m, observed, settings, hold, holdValues);
            conditional = fitter.fit();
            values = conditional.values();
        }
        return new Generated(asimov(m, values), values, conditional);
    }

    /**
     * A generated data set with the parameter values it was generated at (nAll) and, for a
     * post-fit Asimov set, the conditional fit that gave them.
     */
    public record Generated(DataSet data, double[] values, FitResult conditionalFit) { }

    /** Expected count of every bin at {@code values} (nAll, γ included). */
    public static double[] expectedCounts(CompiledModel m, double[] values) {
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), true);
        double[] counts = new double[m.nBins()];
        nll.expectedBins(values, counts);
        return counts;
    }

    /** Auxiliary values a data set generated at {@code values} has without fluctuation. */
    public static double[] generatingAux(CompiledModel m, double[] values) {
        double[] aux = m.auxNominal();
        for (int i = 0; i < m.nAll(); i++) {
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) aux[i] = values[i];
            else if (m.constraintType(i) == ConstraintType.POISSON) aux[i] = m.tau(i) * values[i];
        }
        return aux;
    }
}
