package plumb.engine.likelihood;

import org.apache.commons.math3.special.Gamma;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;

/**
 * The data a likelihood is evaluated on: bin counts, which channels take part, and the auxiliary
 * values of the constraint terms (Gaussian centres, Poisson counts m). Immutable; the data-only
 * constants of −ln L are computed once here.
 *
 * @param kind "observed", "asimov" or "toy": carried into results
 */
public record DataSet(String kind, double[] counts, boolean[] channelIncluded, double[] aux, double constant)
        implements java.io.Serializable {

    /**
     * Builds a data set and its constant Σ [n − n ln n + ln Γ(n+1)] over included bins plus the
     * constraint constants: ln(w√(2π)) per Gaussian, ln Γ(m+1) − m ln τ per Poisson term. The bin
     * part is written so that each bin's remaining term ν − n − n ln(ν/n) vanishes at ν = n:
     * the sum over thousands of bins then keeps its precision near the minimum.
     */
    public static DataSet of(CompiledModel m, String kind, double[] counts, boolean[] channelIncluded, double[] aux) {
        double constant = 0;
        for (int c = 0; c < m.nChannels(); c++) {
            if (!channelIncluded[c]) continue;
            for (int b = m.channelBinStart(c); b < m.channelBinStart(c + 1); b++) {
                double n = counts[b];
                if (n > 0) constant += n - n * Math.log(n) + Gamma.logGamma(n + 1);
            }
        }
        for (int i = 0; i < m.nAll(); i++) {
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
                constant += Math.log(m.width(i) * Math.sqrt(2 * Math.PI));
            } else if (m.constraintType(i) == ConstraintType.POISSON) {
                double mAux = aux[i];
                constant += Gamma.logGamma(mAux + 1) - (mAux > 0 ? mAux * Math.log(m.tau(i)) : 0);
            }
        }
        return new DataSet(kind, counts.clone(), channelIncluded.clone(), aux.clone(), constant);
    }

    /** The observed data: blinded channels are left out, auxiliary values at their nominal. */
    public static DataSet observed(CompiledModel m) {
        double[] counts = new double[m.nBins()];
        boolean[] included = new boolean[m.nChannels()];
        for (int c = 0; c < m.nChannels(); c++) {
            if (m.blinded(c)) continue;
            included[c] = true;
            System.arraycopy(m.observed(c), 0, counts, m.channelBinStart(c), m.bins(c));
        }
        return of(m, "observed", counts, included, m.auxNominal());
    }

    /** True when at least one channel takes part. */
    public boolean anyChannel() {
        for (boolean b : channelIncluded) if (b) return true;
        return false;
    }
}
