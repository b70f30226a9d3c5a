package plumb.engine.inference;

import java.util.Locale;

/**
 * Estimates of what a computation will allocate, checked before it allocates: a request that
 * cannot fit in the Java heap is refused with one line naming its size and the heap limit,
 * instead of an OutOfMemoryError halfway through (or an int overflow of n² on the way there).
 * Sizes are longs throughout.
 */
public final class MemoryBudget {

    /** Largest n with n² elements in one Java array (n² ≤ Integer.MAX_VALUE). */
    public static final int MAX_SQUARE_DIMENSION = 46_340;

    /**
     * n×n double matrices one {@link Fitter} holds or makes per fit: the minimiser's Hessian and its
     * working copy, the reduced system, the Cholesky factor and its work space, for the first
     * attempt and the restart, plus the covariance, its reduced inverse and the result's copy.
     */
    static final int FITTER_MATRICES = 14;

    /** Share of the heap still free that a request may take: the rest is for what runs beside it. */
    static final double SHARE = 0.8;

    private MemoryBudget() {
    }

    /** A request refused before allocating: too large for the heap (the command line's exit status 2). */
    public static final class TooLargeException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public TooLargeException(String message) {
            super(message);
        }
    }

    /** About what one fitter of {@code dimension} variables allocates, in bytes. */
    public static long fitterBytes(long dimension) {
        return FITTER_MATRICES * dimension * dimension * Double.BYTES + 64 * dimension * Double.BYTES;
    }

    /**
     * Refuses a fit of {@code dimension} variables whose matrices cannot be made: n² beyond the
     * largest array, or beyond the heap still free.
     */
    public static void requireFitter(int dimension) {
        if (dimension > MAX_SQUARE_DIMENSION) {
            throw new TooLargeException(String.format(Locale.ROOT,
                    "a fit of %d parameters needs %d×%d matrices, beyond the largest Java array "
                            + "(at most %d parameters); reduce the model (fewer nuisance parameters, pruning)",
                    dimension, dimension, dimension, MAX_SQUARE_DIMENSION));
        }
        require(fitterBytes(dimension), String.format(Locale.ROOT, "a fit of %d parameters", dimension));
    }

    /**
     * Refuses {@code matrices} n×n double matrices for {@code what} (n² beyond the largest array,
     * or beyond the heap still free).
     */
    public static void requireSquares(long n, int matrices, String what) {
        if (n > MAX_SQUARE_DIMENSION) {
            throw new TooLargeException(String.format(Locale.ROOT,
                    "%s needs %d×%d matrices, beyond the largest Java array (n at most %d)", what, n, n, MAX_SQUARE_DIMENSION));
        }
        require(matrices * n * n * Double.BYTES, what);
    }

    /** Refuses {@code bytes} for {@code what} when they exceed the heap still free. */
    public static void require(long bytes, String what) {
        require(bytes, what, null);
    }

    /**
     * As {@link #require(long, String)}, with {@code advice} (null: none) on how to need less,
     * given before the advice to give Java more memory.
     */
    public static void require(long bytes, String what, String advice) {
        if (bytes < 0 || bytes > SHARE * available()) {
            throw new TooLargeException(String.format(Locale.ROOT,
                    "%s needs about %s of memory, more than the %s free in the Java heap (heap limit %s); "
                            + "%sgive Java more with -Xmx, e.g. PLUMB_JAVA_OPTS=-Xmx%dg",
                    what, bytes < 0 ? "more than 8 EB" : human(bytes), human(available()),
                    human(Runtime.getRuntime().maxMemory()), advice == null ? "" : advice + ", or ", suggestGb(bytes)));
        }
    }

    // ---------------------------------------------------------------- toys and scan points

    /**
     * Bytes one toy's or scan point's result is taken to hold while a computation keeps them all
     * (they are combined in index order, which is what makes results independent of threads and
     * batches): a record and a value per parameter.
     */
    public static long taskResultBytes(plumb.engine.compile.CompiledModel m) {
        return 256 + 8L * m.nAll();
    }

    /**
     * Refuses {@code n} toys or scan points of model {@code m} whose results cannot all be kept in
     * the heap still free; {@code what} names the request ("--toys 1000").
     */
    public static void requireTaskResults(long n, plumb.engine.compile.CompiledModel m, String what) {
        require(times(n, taskResultBytes(m)), what);
    }

    /**
     * Refuses an injection run whose toy fits cannot all be kept: {@code perValue} toys at each of
     * {@code values} injected values, each fit with {@code pulls} nuisance pulls
     * ({@link ToyFit#estimatedBytes}). {@code advice} says how to run fewer at once.
     */
    public static void requireInjectionToys(long perValue, int values, int pulls, String what, String advice) {
        require(times(times(perValue, values), ToyFit.estimatedBytes(pulls)), what, advice);
    }

    /** Heap the JVM may still allocate: its limit less what is in use. */
    public static long available() {
        Runtime rt = Runtime.getRuntime();
        return rt.maxMemory() - (rt.totalMemory() - rt.freeMemory());
    }

    /** count × each, or Long.MAX_VALUE where the product overflows. */
    public static long times(long count, long each) {
        try {
            return Math.multiplyExact(count, each);
        } catch (ArithmeticException overflow) {
            return Long.MAX_VALUE;
        }
    }

    private static long suggestGb(long bytes) {
        double used = Runtime.getRuntime().maxMemory() - available();
        double gb = (bytes < 0 ? Double.MAX_VALUE : (bytes / SHARE + used)) / (1L << 30);
        return (long) Math.min(Math.ceil(gb * 1.25), 1L << 40);
    }

    /** 12 MB, 3.4 GB, 1.2 TB. */
    public static String human(long b) {
        if (b >= 1L << 40) return String.format(Locale.ROOT, "%.1f TB", b / (double) (1L << 40));
        if (b >= 1L << 30) return String.format(Locale.ROOT, "%.1f GB", b / (double) (1L << 30));
        return String.format(Locale.ROOT, "%.0f MB", Math.ceil(b / (double) (1L << 20)));
    }
}
