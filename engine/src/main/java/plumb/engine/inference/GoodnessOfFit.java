package plumb.engine.inference;

import org.apache.commons.math3.special.Gamma;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;

import java.util.List;
import java.util.Locale;
import java.util.function.IntConsumer;

/**
 * Saturated-model goodness of fit (S. Baker, R. D. Cousins, Nucl. Instrum. Meth. 221 (1984) 437):
 * twice −ln L at the best fit minus −ln L of a model that fits every count exactly,
 * χ²_λ = Σ_bins 2[ν − n + n ln(n/ν)] + Σ_Gaussian (θ − c)²/w² + Σ_Poisson 2[τγ − m − m ln(τγ/m)],
 * asymptotically χ²(ndof). Each constrained parameter brings one auxiliary measurement and one
 * parameter, so only the free (unconstrained) parameters that are not held reduce ndof:
 * ndof = bins fitted − free parameters not held.
 */
public final class GoodnessOfFit {

    private GoodnessOfFit() {
    }

    /**
     * @param statistic           χ²_λ in total
     * @param ndof                degrees of freedom
     * @param p                   asymptotic p-value, 1 − F_χ²(statistic; ndof), NaN when ndof ≤ 0
     * @param channelStatistic    the bins' part of each channel (NaN for channels not fitted)
     * @param channelBins         bins of each channel that were fitted (0 for channels left out)
     * @param constraintStatistic the constraint terms' part
     * @param fit                 the best fit
     */
    public record Result(double statistic, int ndof, double p, double[] channelStatistic, int[] channelBins,
                         double constraintStatistic, FitResult fit) { }

    /**
     * The saturated statistic of {@code data} at the parameter values {@code values} (nAll).
     *
     * @param channelOut receives the bins' part per channel (length nChannels; NaN for channels
     *                   not in the data set), or null
     * @return the total, constraint terms included
     */
    public static double statistic(CompiledModel m, DataSet data, double[] values, double[] channelOut) {
        double[] nu = DataSets.expectedCounts(m, values);
        double[] n = data.counts();
        double total = 0;
        for (int c = 0; c < m.nChannels(); c++) {
            if (!data.channelIncluded()[c]) {
                if (channelOut != null) channelOut[c] = Double.NaN;
                continue;
            }
            double sum = 0;
            for (int b = m.channelBinStart(c); b < m.channelBinStart(c + 1); b++) {
                double v = Math.max(nu[b], BinnedNll.NU_FLOOR);     // floor of docs/model-format.md
                sum += n[b] > 0 ? 2 * (v - n[b] + n[b] * Math.log(n[b] / v)) : 2 * v;   // n = 0: no 0·ln 0
            }
            if (channelOut != null) channelOut[c] = sum;
            total += sum;
        }
        return total + constraintStatistic(m, data, values);
    }

    private static double constraintStatistic(CompiledModel m, DataSet data, double[] values) {
        double sum = 0;
        double[] aux = data.aux();
        for (int i = 0; i < m.nAll(); i++) {
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
                double d = (values[i] - aux[i]) / m.width(i);
                sum += d * d;
            } else if (m.constraintType(i) == ConstraintType.POISSON) {
                double mu = m.tau(i) * values[i], k = aux[i];
                sum += k > 0 ? 2 * (mu - k - k * Math.log(mu / k)) : 2 * mu;
            }
        }
        return sum;
    }

    /** Degrees of freedom: bins fitted minus free parameters not held in {@code fit}. */
    public static int ndof(CompiledModel m, DataSet data, boolean[] held) {
        int bins = 0;
        for (int c = 0; c < m.nChannels(); c++) if (data.channelIncluded()[c]) bins += m.bins(c);
        int free = 0;
        for (int i = 0; i < m.nAll(); i++) if (m.constraintType(i) == ConstraintType.NONE && !held[i]) free++;
        return bins - free;
    }

    /**
     * Fits {@code data} and returns its saturated statistic, ndof and asymptotic p-value.
     *
     * @throws InferenceException when the fit does not converge
     */
    public static Result compute(Problem p) {
        return compute(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues());
    }

    /** As {@link #compute(Problem)}, with the parts given one by one. */
    public static Result compute(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues) {
        FitResult fit = new Fitter(m, data, settings, held, heldValues).fit();
        if (!PoiProfile.minimumFound(fit)) {
            throw new InferenceException(String.format(Locale.ROOT, "the fit to the %s data did not converge (%s)",
                    data.kind(), fit.status()));
        }
        double[] channels = new double[m.nChannels()];
        int[] bins = new int[m.nChannels()];
        for (int c = 0; c < m.nChannels(); c++) bins[c] = data.channelIncluded()[c] ? m.bins(c) : 0;
        double total = statistic(m, data, fit.values(), channels);
        double binsPart = 0;
        for (double s : channels) if (!Double.isNaN(s)) binsPart += s;
        int ndof = ndof(m, data, fit.held());
        return new Result(total, ndof, pValue(total, ndof), channels, bins, total - binsPart, fit);
    }

    /**
     * 1 − F_χ²(statistic; ndof), NaN when ndof ≤ 0: commons-math's regularised upper incomplete
     * gamma Q(ndof/2, statistic/2), which keeps small p-values that 1 − CDF would round to 0.
     */
    public static double pValue(double statistic, int ndof) {
        if (ndof <= 0) return Double.NaN;
        return Gamma.regularizedGammaQ(0.5 * ndof, 0.5 * Math.max(statistic, 0));
    }

    /**
     * The p-value of the observed statistic from toys drawn at the best fit {@code fitted} (nAll),
     * auxiliary values fluctuated, in the channels {@code data} uses; each toy is fitted from the
     * generating point and its statistic taken at its own best fit.
     *
     * @param progress called with the number of toys finished, or null
     */
    public static ToyPValue toys(CompiledModel m, DataSet data, double observed, double[] fitted, FitSettings settings,
                                 int[] held, double[] heldValues, int toys, long seed, int threads, IntConsumer progress) {
        double[] stats = toyStatistics(m, data, fitted, settings, held, heldValues, toys, seed, threads, progress);
        return ToyPValue.of(observed, stats);
    }

    /** The saturated statistic of each toy (NaN where its fit failed), by toy index. */
    public static double[] toyStatistics(CompiledModel m, DataSet data, double[] fitted, FitSettings settings,
                                         int[] held, double[] heldValues, int toys, long seed, int threads,
                                         IntConsumer progress) {
        return toyStatistics(m, data, fitted, settings, held, heldValues, toys, seed, WorkRunner.threads(threads), progress);
    }

    /** As above, the toys run by {@code runner} (threads or a cluster; the same numbers either way). */
    public static double[] toyStatistics(CompiledModel m, DataSet data, double[] fitted, FitSettings settings,
                                         int[] held, double[] heldValues, int toys, long seed, WorkRunner runner,
                                         IntConsumer progress) {
        List<Double> s = runner.run(m, new ToyWork(data, settings, held, heldValues, fitted.clone(), seed), toys, progress);
        double[] out = new double[toys];
        for (int i = 0; i < toys; i++) out[i] = s.get(i);
        return out;
    }

    /** As {@link #toys(CompiledModel, DataSet, double, double[], FitSettings, int[], double[], int, long, int, IntConsumer)} on {@code runner}. */
    public static ToyPValue toys(CompiledModel m, DataSet data, double observed, double[] fitted, FitSettings settings,
                                 int[] held, double[] heldValues, int toys, long seed, WorkRunner runner, IntConsumer progress) {
        return ToyPValue.of(observed, toyStatistics(m, data, fitted, settings, held, heldValues, toys, seed, runner, progress));
    }

    /** Toy i drawn at the best fit with the stream (seed, i), fitted, its statistic at its own best fit. */
    private record ToyWork(DataSet data, FitSettings settings, int[] held, double[] heldValues, double[] fitted,
                           long seed) implements RangeWork<ToyWork.Worker, Double> {

        record Worker(Fitter fitter, double[] expected, ToyStart start) { }

        @Override
        public Worker worker(CompiledModel m) {
            Fitter fitter = Fitter.valuesOnly(m, data, settings, held, heldValues);
            double[] expected = DataSets.expectedCounts(m, fitted);
            return new Worker(fitter, expected, new ToyStart(fitter, fitted, expected, data.channelIncluded(), held));
        }

        @Override
        public Double run(Worker w, CompiledModel m, int i) {
            DataSet toy = Toys.generate(m, w.expected(), fitted, data.channelIncluded(), seed, i, true);
            w.fitter().setData(toy);
            FitResult r = w.fitter().fit(w.start().of(w.fitter()), -1, 0);
            return PoiProfile.minimumFound(r) ? statistic(m, toy, r.values(), null) : Double.NaN;
        }
    }
}
