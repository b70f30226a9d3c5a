package plumb.engine.inference;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * The discovery test across the signal hypotheses of a search: one model per hypothesis (a mass
 * point, say), each fitted in parallel, ordered by its position, then the look-elsewhere estimate
 * of the largest excess (Gross–Vitells up-crossings) and, on request, background-only toys across
 * all models.
 */
public final class DiscoveryAcrossModels {

    private DiscoveryAcrossModels() {
    }

    /** Levels where the toys' up-crossings are counted, besides the reference level. */
    public static final double[] TOY_LEVELS = {1, 2, 3, 4};

    /**
     * The scan in the order of its positions.
     *
     * @param order    order[i] is the index, in the input, of the i-th point of the scan
     * @param x        the positions, ascending
     * @param observed the discovery test of each point, in scan order
     * @param scan     the local p-value curve and its global estimate
     * @param toys     the background-only toys, null when none were asked for
     */
    public record Result(int[] order, double[] x, List<Discovery.Significance> observed, LookElsewhere.Scan scan,
                         LookElsewhere.Toys toys) { }

    /**
     * @param problems  one per hypothesis, each on its observed data
     * @param x         the position of each problem, same order as {@code problems}
     * @param reference the q0 level whose up-crossings give the global estimate
     * @param toys      the number of background-only toys, or null for none
     * @param progress  receives the number of finished toys (may be called from worker threads)
     * @throws IllegalArgumentException for a bad reference or toy count, or models of other bins
     * @throws InferenceException       when a fit fails
     */
    public static Result compute(List<Problem> problems, double[] x, double reference, Integer toys, long seed,
                                 int threads, IntConsumer progress) {
        if (problems.size() != x.length) {
            throw new IllegalArgumentException(problems.size() + " problems but " + x.length + " positions");
        }
        if (!(reference > 0)) throw new IllegalArgumentException("the reference level must be positive, got " + reference);
        if (toys != null && toys < 1) throw new IllegalArgumentException("the toy count must be at least 1, got " + toys);
        List<Integer> byX = new ArrayList<>();
        for (int i = 0; i < problems.size(); i++) byX.add(i);
        byX.sort(Comparator.comparingDouble(i -> x[i]));
        int n = byX.size();
        int[] order = new int[n];
        double[] sortedX = new double[n];
        List<Problem> sorted = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            order[i] = byX.get(i);
            sortedX[i] = x[order[i]];
            sorted.add(problems.get(order[i]));
        }
        List<Discovery.Significance> sig = ParallelRunner.run(n, threads, () -> null,
                (w, i) -> Discovery.compute(sorted.get(i)), null);
        double[] q = sig.stream().mapToDouble(Discovery.Significance::q0).toArray();
        LookElsewhere.Scan scan = LookElsewhere.scan(sortedX, q, reference);
        LookElsewhere.Toys t = null;
        if (toys != null) {
            double[] levels = new double[TOY_LEVELS.length + 1];
            levels[0] = reference;
            System.arraycopy(TOY_LEVELS, 0, levels, 1, TOY_LEVELS.length);
            t = LookElsewhere.toys(sorted, scan.qMax(), levels, toys, seed, threads, progress);
        }
        return new Result(order, sortedX, List.copyOf(sig), scan, t);
    }
}
