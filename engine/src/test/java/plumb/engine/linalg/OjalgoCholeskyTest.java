package plumb.engine.linalg;

class OjalgoCholeskyTest extends CholeskySolverContract {
    @Override
    CholeskySolver create(int capacity) {
        return new OjalgoCholesky(capacity);
    }
}
