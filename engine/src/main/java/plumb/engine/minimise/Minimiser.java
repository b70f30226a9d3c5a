package plumb.engine.minimise;

/**
 * Minimises an {@link Objective} inside a box, with some variables held fixed. Implementations are
 * reusable for many fits by one thread and not thread-safe.
 */
public interface Minimiser {

    /**
     * Minimises f over lower ≤ x ≤ upper with the variables flagged in {@code fixed} held at their
     * starting values.
     *
     * @param objective the function; its dimension must equal the minimiser's
     * @param start starting point (read, not modified); non-fixed entries outside the bounds are
     *     moved onto the nearest bound, fixed entries are used as they are
     * @param lower lower bounds, {@code -Infinity} allowed
     * @param upper upper bounds, {@code +Infinity} allowed, each ≥ its lower bound; a variable with
     *     equal bounds is treated as fixed
     * @param fixed variables that never move, or {@code null} for none
     * @return the result; numerical failure is reported in its status, never thrown
     * @throws IllegalArgumentException on wrong lengths, NaN start or bounds, or lower > upper
     */
    MinimumResult minimise(Objective objective, double[] start, double[] lower, double[] upper,
            boolean[] fixed);

    /**
     * The covariance of {@code r} ({@link MinimumResult#covariance()}, the same numbers) when this
     * minimiser can give it from work it already did, else null. Only for the last result it returned.
     */
    default double[] covariance(MinimumResult r) {
        return null;
    }

        /** {@link #minimise(Objective, double[], double[], double[], boolean[])} with nothing fixed. */
    default MinimumResult minimise(Objective objective, double[] start, double[] lower, double[] upper) {
        return minimise(objective, start, lower, upper, null);
    }
}
