package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.List;
import java.util.function.IntConsumer;

/**
 * The discovery test of μ = 0 with q0 (Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554,
 * eq. 12): q0 = −2 ln λ(0) for μ̂ ≥ 0 and 0 for μ̂ &lt; 0, asymptotically Z = √q0 and the one-sided
 * p = 1 − Φ(Z) (eqs. 52–53); or p from toys of the background-only hypothesis.
 */
public final class Discovery {

    private Discovery() {
    }

    /**
     * @param q0    the statistic
     * @param z     √q0, the significance in standard deviations
     * @param p     1 − Φ(z)
     * @param muHat best-fit POI value
     * @param fits  fits made
     */
    public record Significance(double q0, double z, double p, double muHat, int fits) { }

    /** q0 on the problem's data, asymptotic Z and p. */
    public static Significance compute(Problem p) {
        return compute(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues());
    }

    /** q0 on {@code data}, asymptotic Z and p. */
    public static Significance compute(CompiledModel m, DataSet data, FitSettings settings, int[] held,
                                       double[] heldValues) {
        PoiProfile profile = new PoiProfile(m, data, settings, held, heldValues, "the " + data.kind() + " data");
        double q0 = profile.q0();
        double z = Math.sqrt(q0);
        return new Significance(q0, z, AsymptoticUpperLimit.upperTail(z), profile.muHat(), profile.fits());
    }

    /**
     * The p-value of the observed q0 from {@code toys} background-only toys. The toys are drawn at
     * μ = 0 with the nuisance parameters at their conditional fit to {@code data} with μ = 0
     * (θ̂̂(0), the usual construction), auxiliary values fluctuated, in the channels {@code data}
     * uses. Toy i depends only on (seed, i); its fits start from the generating point.
     *
     * @param progress called with the number of toys finished, or null
     */
    public static ToyPValue toys(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues,
                                 int toys, long seed, int threads, IntConsumer progress) {
        return toys(m, data, settings, held, heldValues, toys, seed, WorkRunner.threads(threads), progress);
    }

    /** As above, the toys run by {@code runner} (threads or a cluster; the same numbers either way). */
    public static ToyPValue toys(CompiledModel m, DataSet data, FitSettings settings, int[] held, double[] heldValues,
                                 int toys, long seed, WorkRunner runner, IntConsumer progress) {
        PoiProfile profile = new PoiProfile(m, data, settings, held, heldValues, "the " + data.kind() + " data");
        double observed = profile.q0();
        double[] generating = profile.at(0).values();
        List<Double> q = runner.run(m, new ToyWork(data, settings, held, heldValues, generating, seed), toys, progress);
        double[] stats = new double[toys];
        for (int i = 0; i < toys; i++) stats[i] = q.get(i);
        return ToyPValue.of(observed, stats);
    }

    /** Background-only toy i: q0 of the toy drawn at {@code generating} with the stream (seed, i). */
    private record ToyWork(DataSet data, FitSettings settings, int[] held, double[] heldValues, double[] generating,
                           long seed) implements RangeWork<ToyWork.Worker, Double> {

        record Worker(Fitter fitter, double[] expected, ToyStart start) { }

        @Override
        public Worker worker(CompiledModel m) {
            Fitter fitter = Fitter.valuesOnly(m, data, settings, held, heldValues);
            double[] expected = DataSets.expectedCounts(m, generating);
            return new Worker(fitter, expected, new ToyStart(fitter, generating, expected, data.channelIncluded(), held));
        }

        @Override
        public Double run(Worker w, CompiledModel m, int i) {
            w.fitter().setData(Toys.generate(m, w.expected(), generating, data.channelIncluded(), seed, i, true));
            return q0(m, w.fitter(), w.start().of(w.fitter()));
        }
    }

    /** q0 of the fitter's current data, fits started from {@code start}; NaN when a fit fails. */
    static double q0(CompiledModel m, Fitter fitter, double[] start) {
        FitResult best = fitter.fit(start, -1, 0);
        if (!PoiProfile.minimumFound(best)) return Double.NaN;
        if (best.values()[m.poi()] <= 0) return 0;
        FitResult zero = fitter.refitHolding(best, m.poi(), 0);
        if (!PoiProfile.minimumFound(zero)) return Double.NaN;
        return Math.max(0, 2 * (zero.nll() - best.nll()));
    }
}
