package plumb.engine.minimise;

/** Objectives with analytic derivatives and known minima, shared by the minimiser tests. */
final class TestObjectives {

    private TestObjectives() {
    }

    /** Base class: value and valueAndGradient delegate to valueGradientHessian. */
    abstract static class Analytic implements Objective {
        final int n;
        private final double[] g;
        private final double[] h;
        int valueCalls;
        int gradientCalls;
        int hessianCalls;

        Analytic(int n) {
            this.n = n;
            this.g = new double[n];
            this.h = new double[n * n];
        }

        @Override
        public int dimension() {
            return n;
        }

        @Override
        public double value(double[] x) {
            valueCalls++;
            return compute(x, g, h);
        }

        @Override
        public double valueAndGradient(double[] x, double[] gradient) {
            gradientCalls++;
            return compute(x, gradient, h);
        }

        @Override
        public double valueGradientHessian(double[] x, double[] gradient, double[] hessian) {
            hessianCalls++;
            return compute(x, gradient, hessian);
        }

        int calls() {
            return valueCalls + gradientCalls + hessianCalls;
        }

        abstract double compute(double[] x, double[] gradient, double[] hessian);
    }

    /** f = ½ (x − m)ᵀ A (x − m) + c: minimum c at m, Hessian A everywhere. */
    static final class Quadratic extends Analytic {
        final double[] a;
        final double[] m;
        final double c;

        Quadratic(double[] a, double[] m, double c) {
            super(m.length);
            this.a = a;
            this.m = m;
            this.c = c;
        }

        @Override
        double compute(double[] x, double[] gradient, double[] hessian) {
            double f = c;
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int j = 0; j < n; j++) {
                    s += a[i * n + j] * (x[j] - m[j]);
                }
                gradient[i] = s;
                f += 0.5 * (x[i] - m[i]) * s;
            }
            System.arraycopy(a, 0, hessian, 0, n * n);
            return f;
        }
    }

    /**
     * Chained Rosenbrock f = Σ_{i<n−1} [100 (x_{i+1} − x_i²)² + (1 − x_i)²]; global minimum 0 at
     * x = (1, …, 1) (from memory; common practice as a test function).
     */
    static final class Rosenbrock extends Analytic {
        Rosenbrock(int n) {
            super(n);
        }

        @Override
        double compute(double[] x, double[] gradient, double[] hessian) {
            java.util.Arrays.fill(gradient, 0);
            java.util.Arrays.fill(hessian, 0);
            double f = 0;
            for (int i = 0; i < n - 1; i++) {
                final double u = x[i + 1] - x[i] * x[i];
                final double v = 1 - x[i];
                f += 100 * u * u + v * v;
                gradient[i] += -400 * x[i] * u - 2 * v;
                gradient[i + 1] += 200 * u;
                hessian[i * n + i] += 1200 * x[i] * x[i] - 400 * x[i + 1] + 2;
                hessian[i * n + i + 1] += -400 * x[i];
                hessian[(i + 1) * n + i] += -400 * x[i];
                hessian[(i + 1) * n + i + 1] += 200;
            }
            return f;
        }
    }

    /**
     * Binned Poisson −ln L (constant ln n! dropped) with ν_b = μ s_b + Σ_k β_kb θ_k and a unit
     * Gaussian constraint (θ_k − 1)²/(2 δ_k²) per nuisance; variables (μ, θ_1, …).
     */
    static final class PoissonToy extends Analytic {
        final double[] n;
        final double[] s;
        final double[][] beta;
        final double[] delta;

        PoissonToy(double[] counts, double[] signal, double[][] beta, double[] delta) {
            super(1 + beta.length);
            this.n = counts;
            this.s = signal;
            this.beta = beta;
            this.delta = delta;
        }

        @Override
        double compute(double[] x, double[] gradient, double[] hessian) {
            final int p = dimension();
            java.util.Arrays.fill(gradient, 0);
            java.util.Arrays.fill(hessian, 0);
            final double[] dnu = new double[p];
            double f = 0;
            for (int b = 0; b < n.length; b++) {
                double nu = x[0] * s[b];
                dnu[0] = s[b];
                for (int k = 0; k < beta.length; k++) {
                    nu += beta[k][b] * x[k + 1];
                    dnu[k + 1] = beta[k][b];
                }
                if (!(nu > 0)) {
                    return Double.NaN; // outside the model's domain
                }
                f += nu - n[b] * Math.log(nu);
                final double w = 1 - n[b] / nu;
                final double c = n[b] / (nu * nu);
                for (int i = 0; i < p; i++) {
                    gradient[i] += w * dnu[i];
                    for (int j = 0; j < p; j++) {
                        hessian[i * p + j] += c * dnu[i] * dnu[j];
                    }
                }
            }
            for (int k = 0; k < beta.length; k++) {
                final double t = (x[k + 1] - 1) / delta[k];
                f += 0.5 * t * t;
                gradient[k + 1] += t / delta[k];
                hessian[(k + 1) * p + k + 1] += 1 / (delta[k] * delta[k]);
            }
            return f;
        }
    }
}
