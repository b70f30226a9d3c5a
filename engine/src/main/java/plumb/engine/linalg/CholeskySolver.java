package plumb.engine.linalg;

/**
 * Cholesky factorisation A = L·Lᵀ of a symmetric positive-definite matrix, and what the fits need
 * from it: solutions and the inverse (a covariance from a Hessian).
 *
 * <p>Matrices are flat row-major {@code double[]}: a matrix of size m occupies the first m·m entries
 * with row stride m, so one work array sized for the largest system serves every smaller one (the
 * minimisers factor the Hessian restricted to a changing set of free variables). Only the lower
 * triangle (column ≤ row) is read. An instance is reusable and not thread-safe; after construction
 * it allocates nothing in {@link #decompose}, {@link #solve} or {@link #invert}.
 *
 * <p>A matrix that is not positive definite is a numerical outcome, not an error:
 * {@link #decompose} returns {@code false} and never throws for it (NaN or infinite entries also
 * give {@code false}). Misuse (a size beyond the capacity, short arrays, solving before a successful
 * decomposition) throws.
 */
public interface CholeskySolver {

    /** Largest matrix size this instance can factor. */
    int capacity();

    /** Size m of the last successful decomposition, 0 before any. */
    int size();

    /**
     * Factors the m×m matrix in {@code matrix[0 .. m·m)} (row-major, lower triangle read, the array
     * is not modified).
     *
     * @return {@code true} when the matrix is positive definite and the factor finite,
     *     {@code false} otherwise (the solver then holds no factor)
     * @throws IllegalArgumentException if m is negative or above {@link #capacity()}, or the array
     *     is shorter than m·m
     */
    boolean decompose(double[] matrix, int m);

    /**
     * Solves A·x = b for the last factored A. {@code rhs} and {@code solution} may be the same
     * array; entries from m on are neither read nor written.
     *
     * @throws IllegalStateException if no decomposition succeeded
     * @throws IllegalArgumentException if an array is shorter than m
     */
    void solve(double[] rhs, double[] solution);

    /**
     * Writes A⁻¹ (both triangles, row-major, stride m) into {@code inverse[0 .. m·m)}.
     *
     * @throws IllegalStateException if no decomposition succeeded
     * @throws IllegalArgumentException if the array is shorter than m·m
     */
    void invert(double[] inverse);

    /** Our hand-written kernel, sized for matrices up to {@code capacity}. */
    static CholeskySolver create(int capacity) {
        return new DenseCholesky(capacity);
    }
}
