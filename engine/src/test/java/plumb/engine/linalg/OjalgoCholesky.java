package plumb.engine.linalg;

import org.ojalgo.matrix.decomposition.Cholesky;
import org.ojalgo.matrix.store.MatrixStore;
import org.ojalgo.matrix.store.R064Store;

/**
 * {@link CholeskySolver} backed by ojalgo's Cholesky decomposition: a second, independent
 * implementation of the same contract, used to cross-check {@link DenseCholesky} and available
 * where allocation per call does not matter. It copies the matrix into an ojalgo store (ojalgo
 * stores are column-major; the lower triangle is copied to both triangles, so the layout does not
 * matter for a symmetric matrix).
 */
public final class OjalgoCholesky implements CholeskySolver {

    static {
        // ojalgo prints a hardware-profile notice to stdout when its classes first load on an
        // unknown machine unless this property is set; the engine never prints.
        if (System.getProperty("shut.up.ojAlgo") == null) {
            System.setProperty("shut.up.ojAlgo", "true");
        }
    }

    private final int capacity;
    private final Cholesky<Double> decomposition = Cholesky.R064.make();
    private R064Store store;
    private int size;
    private boolean factored;

    /** @param capacity largest matrix size to factor, at least 0 */
    public OjalgoCholesky(int capacity) {
        if (capacity < 0) {
            throw new IllegalArgumentException("capacity " + capacity + " is negative");
        }
        this.capacity = capacity;
    }

    @Override
    public int capacity() {
        return capacity;
    }

    @Override
    public int size() {
        return size;
    }

    @Override
    public boolean decompose(double[] matrix, int m) {
        Checks.matrixArgument(matrix, m, capacity);
        size = 0;
        factored = false;
        if (m == 0) {
            factored = true;
            return true;
        }
        if (store == null || store.getRowDim() != m) {
            store = R064Store.FACTORY.make(m, m);
        }
        for (int i = 0; i < m; i++) {
            final int row = i * m;
            for (int j = 0; j <= i; j++) {
                final double v = matrix[row + j];
                // ojalgo's pivot test is "> 0", which an infinite entry can pass; reject it here.
                if (!Double.isFinite(v)) {
                    return false;
                }
                store.set(i, j, v);
                store.set(j, i, v);
            }
        }
        if (!decomposition.decompose(store) || !decomposition.isSPD()) {
            return false;
        }
        size = m;
        factored = true;
        return true;
    }

    @Override
    public void solve(double[] rhs, double[] solution) {
        requireFactor();
        Checks.vectorArgument(rhs, size, "rhs");
        Checks.vectorArgument(solution, size, "solution");
        if (size == 0) {
            return;
        }
        final R064Store b = R064Store.FACTORY.make(size, 1);
        for (int i = 0; i < size; i++) {
            b.set(i, 0, rhs[i]);
        }
        final MatrixStore<Double> x = decomposition.getSolution(b);
        for (int i = 0; i < size; i++) {
            solution[i] = x.doubleValue(i, 0);
        }
    }

    @Override
    public void invert(double[] inverse) {
        requireFactor();
        Checks.vectorArgument(inverse, size * size, "inverse");
        if (size == 0) {
            return;
        }
        final MatrixStore<Double> inv = decomposition.getInverse();
        for (int i = 0; i < size; i++) {
            final int row = i * size;
            for (int j = 0; j < size; j++) {
                inverse[row + j] = inv.doubleValue(i, j);
            }
        }
    }


    private void requireFactor() {
        if (!factored) {
            throw new IllegalStateException("no successful decomposition to use");
        }
    }
}
