package plumb.engine.linalg;

class DenseCholeskyTest extends CholeskySolverContract {
    @Override
    CholeskySolver create(int capacity) {
        return new DenseCholesky(capacity);
    }
}
