package plumb.engine.minimise;

import java.util.Locale;

/**
 * The validated bounds and fixed mask of one minimisation. Variables with equal bounds are held
 * like fixed ones ({@link #held}).
 */
final class Box {

    final int n;
    final double[] lower;
    final double[] upper;
    /** Fixed by the caller or pinned by equal bounds: never moves. */
    final boolean[] held;

    private Box(double[] lower, double[] upper, boolean[] held) {
        this.n = lower.length;
        this.lower = lower;
        this.upper = upper;
        this.held = held;
    }

    /** Validates the arguments of {@link Minimiser#minimise}; the arrays are copied. */
    static Box of(int n, Objective objective, double[] start, double[] lower, double[] upper,
            boolean[] fixed) {
        if (objective.dimension() != n) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "objective has dimension %d, the minimiser was built for %d", objective.dimension(), n));
        }
        if (start.length != n || lower.length != n || upper.length != n
                || (fixed != null && fixed.length != n)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "expected arrays of length %d, got start %d, lower %d, upper %d, fixed %s", n,
                    start.length, lower.length, upper.length, fixed == null ? "null" : fixed.length));
        }
        final boolean[] held = new boolean[n];
        for (int i = 0; i < n; i++) {
            // Valid case first: NaN bounds or start fail the test.
            if (!(lower[i] <= upper[i]) || lower[i] == Double.POSITIVE_INFINITY
                    || upper[i] == Double.NEGATIVE_INFINITY) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "bounds of variable %d are [%s, %s], need lower <= upper", i, lower[i], upper[i]));
            }
            if (!Double.isFinite(start[i])) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "start value of variable %d is %s, must be finite", i, start[i]));
            }
            held[i] = (fixed != null && fixed[i]) || lower[i] == upper[i];
        }
        return new Box(lower.clone(), upper.clone(), held);
    }

    /** Writes the start point into x: non-held entries clipped into the bounds. */
    void startPoint(double[] start, double[] x) {
        for (int i = 0; i < n; i++) {
            x[i] = held[i] ? start[i] : clip(i, start[i]);
        }
    }

    double clip(int i, double v) {
        return Math.min(upper[i], Math.max(lower[i], v));
    }

    /**
     * Whether variable i stays put for the next step: held, or sitting on a bound with the
     * gradient pushing it outward (the bound is active).
     */
    boolean stays(int i, double xi, double gi) {
        return held[i] || (xi <= lower[i] && gi > 0) || (xi >= upper[i] && gi < 0);
    }

    /**
     * A deterministic nearby point for the restart: each free variable moved by 5 % of its range
     * (or of max(1, |x|) when unbounded), alternating in sign, turned back inside at a bound.
     */
    void perturb(double[] from, double[] to) {
        for (int i = 0; i < n; i++) {
            if (held[i]) {
                to[i] = from[i];
                continue;
            }
            final double range = upper[i] - lower[i];
            final double width = range < Double.POSITIVE_INFINITY ? range : Math.max(1, Math.abs(from[i]));
            final double delta = (i % 2 == 0 ? 0.05 : -0.05) * width;
            double v = from[i] + delta;
            if (v > upper[i] || v < lower[i]) {
                v = from[i] - delta;
            }
            to[i] = clip(i, v);
        }
    }
}
