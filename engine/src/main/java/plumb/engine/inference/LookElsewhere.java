package plumb.engine.inference;

import org.apache.commons.math3.distribution.NormalDistribution;
import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.DataSet;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.IntConsumer;

/**
 * The look-elsewhere effect of a search over a mass (or any label): the local discovery p-value at
 * every hypothesis and the global significance of the largest excess, by the up-crossings method
 * of E. Gross and O. Vitells, Eur. Phys. J. C 70 (2010) 525: for the q0 process over the mass, the
 * expected number of up-crossings of a level c falls as E[N(c)] = E[N(c₀)]·exp(−(c − c₀)/2), and
 * the global p-value of the largest local q0 = c is p_global ≈ p_local(c) + E[N(c₀)]·exp(−(c − c₀)/2),
 * E[N(c₀)] estimated by the up-crossings of a low reference level c₀ counted on the observed scan
 * (or averaged over background-only toys). Optionally the global p-value from background-only
 * toys thrown across all mass points at once.
 */
public final class LookElsewhere {

    private static final NormalDistribution NORMAL = new NormalDistribution(null, 0, 1);

    private LookElsewhere() {
    }

    /**
     * The asymptotic result of one scan.
     *
     * @param x            the label values, ascending
     * @param q0           local q0 at each
     * @param pLocal       local one-sided p-value 1 − Φ(√q0)
     * @param best         index of the largest q0
     * @param reference    the reference level c₀
     * @param upcrossings  up-crossings of c₀ counted on the scan
     * @param pGlobal      p_local(max) + N(c₀)·exp(−(max − c₀)/2), at most 1
     * @param zGlobal      Φ⁻¹(1 − pGlobal)
     * @param trials       pGlobal / p_local(max)
     */
    public record Scan(double[] x, double[] q0, double[] pLocal, int best, double reference, int upcrossings,
                       double pGlobal, double zGlobal, double trials) {
        public double qMax() {
            return q0[best];
        }

        public double zLocal() {
            return Math.sqrt(q0[best]);
        }

        public double pLocalMax() {
            return pLocal[best];
        }
    }

    /**
     * Background-only toys across every mass point at once (one data set per toy, fitted by every model).
     *
     * @param global        the toy p-value of the largest observed q0 against the toys' largest q0
     * @param levels        levels c where the toys' up-crossings were counted
     * @param meanCrossings mean up-crossings of each level over the converged toys
     * @param crossingErrors standard error of each mean
     * @param maxQ0         the largest q0 of each toy (NaN for a failed toy)
     */
    public record Toys(ToyPValue global, double zGlobal, double[] levels, double[] meanCrossings,
                       double[] crossingErrors, double[] maxQ0, long seed) { }

    /** Up-crossings of level c: steps from below c to at least c between neighbouring points. */
    public static int upcrossings(double[] q, double c) {
        int n = 0;
        for (int i = 1; i < q.length; i++) if (q[i - 1] < c && q[i] >= c) n++;
        return n;
    }

    /** The one-sided local p-value of q0: 1 − Φ(√q0). */
    public static double pLocal(double q0) {
        return AsymptoticUpperLimit.upperTail(Math.sqrt(Math.max(0, q0)));
    }

    /** Φ⁻¹(1 − p): the significance of a one-sided p-value. */
    public static double z(double p) {
        if (!(p > 0)) return p == 0 ? Double.POSITIVE_INFINITY : Double.NaN;
        if (p >= 1) return Double.NEGATIVE_INFINITY;
        return -NORMAL.inverseCumulativeProbability(p);
    }

    /**
     * The Gross–Vitells estimate from a scan.
     *
     * @param x  label values, ascending
     * @param q0 local q0 at each (finite)
     * @param reference c₀, below the largest q0
     */
    public static Scan scan(double[] x, double[] q0, double reference) {
        if (x.length != q0.length || x.length < 2) throw new IllegalArgumentException("a scan needs two points or more");
        int best = 0;
        for (int i = 1; i < q0.length; i++) if (q0[i] > q0[best]) best = i;
        double[] p = new double[q0.length];
        for (int i = 0; i < q0.length; i++) p[i] = pLocal(q0[i]);
        int n = upcrossings(q0, reference);
        double c = q0[best];
        double global = Math.min(1, p[best] + n * Math.exp(-(c - reference) / 2));
        return new Scan(x.clone(), q0.clone(), p, best, reference, n, global, z(global), global / p[best]);
    }

    /**
     * The global p-value from {@code toys} background-only toys: each toy is one data set drawn from
     * the first model at μ = 0 with its nuisance parameters at their fit to the observed data with
     * μ = 0 (auxiliary values fluctuated), fitted by every model; its statistic is the largest q0
     * over the models. The models must share their bins (one spectrum, several signal hypotheses);
     * auxiliary values go to the parameters of the same name in the other models. Toy i depends
     * only on (seed, i).
     *
     * @param problems one per mass point, in the order of the scan, each on its observed data
     * @param levels   levels where the toys' up-crossings are counted
     * @throws IllegalArgumentException when the models' bins differ
     */
    public static Toys toys(List<Problem> problems, double observedMax, double[] levels, int toys, long seed,
                            int threads, IntConsumer progress) {
        CompiledModel first = problems.get(0).model();
        for (Problem p : problems) {
            if (p.model().nBins() != first.nBins() || p.model().nChannels() != first.nChannels()) {
                throw new IllegalArgumentException("model '" + p.model().name() + "' has other bins than '" + first.name()
                        + "': background-only toys across the scan need one binning");
            }
        }
        int n = problems.size();
        double[][] start = new double[n][];
        for (int k = 0; k < n; k++) {
            Problem p = problems.get(k);
            PoiProfile profile = new PoiProfile(p.model(), p.data(), p.settings(), p.heldIndices(), p.heldValues(),
                    "the " + p.data().kind() + " data of model '" + p.model().name() + "'");
            start[k] = profile.at(0).values();
        }
        double[] generating = start[0];
        double[] expected = DataSets.expectedCounts(first, generating);
        boolean[] channels = problems.get(0).data().channelIncluded();
        int[][] auxMap = new int[n][];
        for (int k = 0; k < n; k++) auxMap[k] = auxMap(first, problems.get(k).model());
        double[][] perToy = ParallelRunner.run(toys, threads, () -> {
            Fitter[] fitters = new Fitter[n];
            for (int k = 0; k < n; k++) fitters[k] = Fitter.valuesOnly(problems.get(k));
            return fitters;
        }, (fitters, i) -> {
            DataSet d = plumb.engine.inference.Toys.generate(first, expected, generating, channels, seed, i, true);
            double[] q = new double[n];
            for (int k = 0; k < n; k++) {
                CompiledModel mk = problems.get(k).model();
                double[] aux = DataSets.generatingAux(mk, start[k]);
                for (int j = 0; j < mk.nAll(); j++) if (auxMap[k][j] >= 0) aux[j] = d.aux()[auxMap[k][j]];
                fitters[k].setData(DataSet.of(mk, "toy", d.counts(), problems.get(k).data().channelIncluded(), aux));
                q[k] = Discovery.q0(mk, fitters[k], start[k]);
            }
            return q;
        }, progress).toArray(new double[0][]);
        double[] maxQ = new double[toys];
        double[] sum = new double[levels.length], sum2 = new double[levels.length];
        int ok = 0;
        for (int i = 0; i < toys; i++) {
            double[] q = perToy[i];
            boolean failed = Arrays.stream(q).anyMatch(Double::isNaN);
            maxQ[i] = failed ? Double.NaN : Arrays.stream(q).max().orElse(Double.NaN);
            if (failed) continue;
            ok++;
            for (int l = 0; l < levels.length; l++) {
                int c = upcrossings(q, levels[l]);
                sum[l] += c;
                sum2[l] += (double) c * c;
            }
        }
        double[] mean = new double[levels.length], err = new double[levels.length];
        for (int l = 0; l < levels.length; l++) {
            mean[l] = ok > 0 ? sum[l] / ok : Double.NaN;
            double var = ok > 1 ? (sum2[l] - ok * mean[l] * mean[l]) / (ok - 1) : Double.NaN;
            err[l] = ok > 0 ? Math.sqrt(Math.max(0, var) / ok) : Double.NaN;
        }
        ToyPValue global = ToyPValue.of(observedMax, maxQ);
        return new Toys(global, z(global.p()), levels.clone(), mean, err, maxQ, seed);
    }

    /** For each parameter of {@code to}, the index of the parameter of the same name and constraint in {@code from}, or −1. */
    private static int[] auxMap(CompiledModel from, CompiledModel to) {
        Map<String, Integer> byName = new HashMap<>();
        for (int i = 0; i < from.nAll(); i++) byName.put(from.parameterNames(i), i);
        int[] map = new int[to.nAll()];
        for (int j = 0; j < to.nAll(); j++) {
            Integer i = byName.get(to.parameterNames(j));
            map[j] = i != null && from.constraintType(i) == to.constraintType(j) ? i : -1;
        }
        return map;
    }
}
