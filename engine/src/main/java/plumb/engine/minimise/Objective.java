package plumb.engine.minimise;

/**
 * A smooth function of n variables to minimise, with analytic derivatives. Implementations are not
 * thread-safe: each thread uses its own instance. Arrays passed in are read or filled, never kept.
 */
public interface Objective {

    /** Number of variables n. */
    int dimension();

    /** f(x). */
    double value(double[] x);

    /** f(x); fills {@code gradient} (length n) with ∇f(x). */
    double valueAndGradient(double[] x, double[] gradient);

    /**
     * f(x); fills {@code gradient} (length n) and {@code hessian} (length n·n, row-major, both
     * triangles) with ∇f(x) and ∇²f(x).
     */
    double valueGradientHessian(double[] x, double[] gradient, double[] hessian);

    /**
     * f(x), ∇f(x), and a positive semidefinite curvature matrix close to ∇²f(x) near a minimum
     * (e.g. the Gauss–Newton form of a likelihood), for points where the Hessian is indefinite.
     * The default is the Hessian itself.
     */
    default double valueGradientCurvature(double[] x, double[] gradient, double[] curvature) {
        return valueGradientHessian(x, gradient, curvature);
    }
}
