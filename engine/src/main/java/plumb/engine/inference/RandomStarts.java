package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.util.SplittableRandom;

/**
 * Seeded random start points for a fit that looks for several minima ({@code fit --starts N}):
 * every constrained parameter not held drawn uniformly within ±{@link #WIDTHS} pre-fit widths of
 * its nominal value (clipped to its range); free parameters, which have no pre-fit width, and held
 * ones keep the nominal start. Start i depends only on (seed, i).
 */
public final class RandomStarts {

    /** Half-width of the box the starts are drawn in, in pre-fit widths. */
    public static final double WIDTHS = 2;

    private RandomStarts() {
    }

    /**
     * {@code count} starts around {@code nominal} (a fitter's {@link Fitter#nominalStart()}).
     *
     * @param held parameters (length ≥ nominal.length) that keep their value
     */
    public static double[][] around(CompiledModel m, double[] nominal, boolean[] held, int count, long seed) {
        if (count < 0) throw new IllegalArgumentException("a number of starts must be >= 0, got " + count);
        double[][] out = new double[count][];
        for (int s = 0; s < count; s++) {
            // One stream per start, mixed from (seed, index): starts do not shift when count changes.
            SplittableRandom rng = new SplittableRandom(seed * 0x9E3779B97F4A7C15L + s);
            double[] x = nominal.clone();
            for (int i = 0; i < x.length; i++) {
                double w = m.prefitWidth(i);
                if (held[i] || !m.constrained(i) || !(w > 0) || !Double.isFinite(w)) continue;
                double v = nominal[i] + WIDTHS * w * (2 * rng.nextDouble() - 1);
                x[i] = Math.max(m.lower(i), Math.min(m.upper(i), v));
            }
            out[s] = x;
        }
        return out;
    }
}
