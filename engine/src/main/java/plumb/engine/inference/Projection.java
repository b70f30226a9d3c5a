package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelVariants;
import plumb.engine.likelihood.DataSet;

import java.util.Arrays;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * How the reach grows with more data: the expected median CLs limit and the expected discovery
 * significance Z_A (Asimov data sets, Cowan, Cranmer, Gross, Vitells, EPJ C 71 (2011) 1554) with
 * every expected yield scaled by a luminosity factor L, in three scenarios ({@link Scenario}).
 * The Asimov data sets are generated at the nuisance values of the model as it is (post-fit or
 * nominal), with the yields of the scaled model.
 */
public final class Projection {

    private Projection() {
    }

    /** What is assumed about the uncertainties as the data grow. */
    public enum Scenario {
        /** Every constraint as it is now. */
        SYSTEMATICS("systematics as they are"),
        /** MC-statistics widths scaled by 1/√L: the simulation grows with the data. */
        MC_SCALED("MC statistics scaled 1/sqrt(L)"),
        /** Every constrained parameter held: statistical uncertainty only. */
        STAT_ONLY("statistics only");

        private final String label;

        Scenario(String label) {
            this.label = label;
        }

        public String label() {
            return label;
        }

        /** The key used in JSON: "systematics", "mcScaled", "statOnly". */
        public String key() {
            return switch (this) {
                case SYSTEMATICS -> "systematics";
                case MC_SCALED -> "mcScaled";
                case STAT_ONLY -> "statOnly";
            };
        }
    }

    /**
     * One luminosity factor in one scenario. Limit and Z are NaN when the computation failed
     * ({@code error} says why).
     */
    public record Point(double lumi, Scenario scenario, double limit, ExpectedBands bands, double z, String error) { }

    /** Every point, by luminosity factor and then scenario in declaration order. */
    public record Result(String poi, double cl, double[] lumis, List<Point> points, int fits, double seconds) {
        public Point at(double lumi, Scenario s) {
            for (Point p : points) if (p.lumi() == lumi && p.scenario() == s) return p;
            return null;
        }
    }

    /**
     * @param p        the model, its held parameters and fit settings (its data set is not used)
     * @param postfit  Asimov nuisance values from a fit to the observed data (else nominal)
     * @param lumis    luminosity factors, each &gt; 0 (1 = the model as it is)
     * @param progress called with the number of points finished, or null
     * @throws InferenceException when the fit that sets the Asimov values fails
     */
    public static Result compute(Problem p, boolean postfit, double cl, double[] lumis, int threads,
                                 IntConsumer progress) {
        CompiledModel m = p.model();
        if (m.poi() < 0) throw new IllegalArgumentException("the model names no parameter of interest");
        for (double l : lumis) if (!(l > 0 && Double.isFinite(l))) throw new IllegalArgumentException("luminosity factor " + l);
        long t0 = System.nanoTime();
        int[] held = p.heldIndices();
        double[] heldValues = p.heldValues();
        Sensitivity.AsimovPair asimov = Sensitivity.AsimovPair.of(m, held, heldValues, postfit, p.settings());
        Scenario[] scenarios = Scenario.values();
        int n = lumis.length * scenarios.length;
        int[] fits = new int[n];
        List<Point> points = ParallelRunner.run(n, threads, () -> null, (w, task) -> {
            double lumi = lumis[task / scenarios.length];
            Scenario s = scenarios[task % scenarios.length];
            return point(m, asimov, p.settings(), held, heldValues, cl, lumi, s, fits, task);
        }, progress);
        return new Result(m.parameterNames(m.poi()), cl, lumis.clone(), points, Arrays.stream(fits).sum(),
                (System.nanoTime() - t0) * 1e-9);
    }

    private static Point point(CompiledModel m, Sensitivity.AsimovPair asimov, FitSettings settings, int[] held,
                               double[] heldValues, double cl, double lumi, Scenario s, int[] fits, int task) {
        CompiledModel scaled = ModelVariants.yieldsScaled(m, lumi);
        int[] gammas = java.util.stream.IntStream.range(m.nParams(), m.nAll()).toArray();
        if (s == Scenario.MC_SCALED && gammas.length > 0) {
            scaled = ModelVariants.constraintsScaled(scaled, gammas, 1 / Math.sqrt(lumi));
        }
        try {
            DataSet a0 = asimovOf(scaled, asimov.zero()), a1 = asimovOf(scaled, asimov.one());
            int[] h0 = held, h1 = held;
            double[] v0 = heldValues, v1 = heldValues;
            if (s == Scenario.STAT_ONLY) {
                int[] constrained = java.util.stream.IntStream.range(0, m.nAll())
                        .filter(i -> i != m.poi() && m.constrained(i) && !contains(held, i)).toArray();
                h0 = h1 = concat(held, constrained);
                v0 = concat(heldValues, pick(asimov.zero().values(), constrained));
                v1 = concat(heldValues, pick(asimov.one().values(), constrained));
            }
            LimitResult limit = AsymptoticUpperLimit.compute(scaled, null, a0, settings, h0, v0, cl);
            Discovery.Significance d = Discovery.compute(scaled, a1, settings, h1, v1);
            fits[task] = limit.fits() + d.fits();
            return new Point(lumi, s, limit.expected().median(), limit.expected(), d.z(), null);
        } catch (InferenceException e) {
            return new Point(lumi, s, Double.NaN, ExpectedBands.missing(), Double.NaN, e.getMessage());
        }
    }

    /** The Asimov set of the scaled model at the generating values of the model as it is. */
    private static DataSet asimovOf(CompiledModel scaled, DataSets.Generated g) {
        return DataSets.asimov(scaled, g.values());
    }

    private static boolean contains(int[] a, int v) {
        for (int x : a) if (x == v) return true;
        return false;
    }

    private static int[] concat(int[] a, int[] b) {
        int[] out = Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }

    private static double[] concat(double[] a, double[] b) {
        double[] out = Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }

    private static double[] pick(double[] values, int[] idx) {
        double[] out = new double[idx.length];
        for (int k = 0; k < idx.length; k++) out[k] = values[idx[k]];
        return out;
    }
}
