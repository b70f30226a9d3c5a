package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.linalg.CholeskySolver;

import java.util.Arrays;

/**
 * Where the fit of a toy starts: one Fisher-scoring step from the generating point,
 * θ₀ = θ_gen − I⁻¹ ∇(−ln L_toy)(θ_gen), with I the Hessian of −ln L on the toys' expected data (the
 * Asimov set of the generating point) at θ_gen, i.e. the expected information. I is the same for
 * every toy, so a worker factors it once; a toy then pays one value and gradient, a solve and one
 * value, where the Newton iteration it replaces pays a Hessian and a factorisation. To first order
 * in the toy's fluctuation the step lands on the toy's minimum, so the fit needs fewer iterations.
 *
 * <p>The start depends only on the toy's data and the generating point, so toys stay independent
 * of threads and batches. Held and fixed parameters keep their generating values, the others are
 * clipped into their range. The generating point itself is the start when I is not positive
 * definite or when the step does not lower −ln L.
 */
public final class ToyStart {

    private final int dim;
    private final double[] generating;
    /** Parameters the step moves: not fixed, not held, with room to move. */
    private final int[] free;
    /** The factor of I over {@link #free}; null when I is not positive definite (no step). */
    private final CholeskySolver information;
    private final double[] lower;
    private final double[] upper;
    private final double[] gradient;
    private final double[] step;

    /**
     * @param fitter     the worker's fitter (its likelihood is borrowed to evaluate I; its data is
     *                   put back)
     * @param generating the generating point (nAll values)
     * @param expected   expected count of every bin at the generating point
     * @param channels   channels the toys fill
     * @param held       parameters the toys' fits hold besides the model's fixed ones
     */
    public ToyStart(Fitter fitter, double[] generating, double[] expected, boolean[] channels, int[] held) {
        CompiledModel m = fitter.model();
        this.dim = fitter.dimension();
        this.generating = Arrays.copyOf(generating, dim);
        this.lower = m.lower();
        this.upper = m.upper();
        this.gradient = new double[dim];
        this.step = new double[dim];
        int[] f = new int[dim];
        int k = 0;
        for (int i = 0; i < dim; i++) {
            if (!m.fixed(i) && !contains(held, i) && lower[i] < upper[i]) f[k++] = i;
        }
        this.free = Arrays.copyOf(f, k);
        BinnedNll nll = fitter.likelihood();
        DataSet own = nll.data();
        nll.setData(DataSet.of(m, "asimov", expected, channels, DataSets.generatingAux(m, generating)));
        double[] hessian = new double[dim * dim];
        nll.valueGradientHessian(this.generating, gradient, hessian);
        nll.setData(own);
        double[] reduced = new double[k * k];
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) reduced[a * k + b] = hessian[free[a] * dim + free[b]];
        }
        CholeskySolver cholesky = CholeskySolver.create(k);
        this.information = cholesky.decompose(reduced, k) ? cholesky : null;
    }

    /** The start of a fit of the fitter's current data: a new array of length {@link Fitter#dimension()}. */
    public double[] of(Fitter fitter) {
        double[] start = generating.clone();
        if (information == null || free.length == 0) return start;
        BinnedNll nll = fitter.likelihood();
        double atGenerating = nll.valueAndGradient(generating, gradient);
        for (int a = 0; a < free.length; a++) step[a] = gradient[free[a]];
        information.solve(step, step);
        for (int a = 0; a < free.length; a++) {
            int i = free[a];
            start[i] = Math.max(lower[i], Math.min(upper[i], generating[i] - step[a]));
        }
        return nll.value(start) < atGenerating ? start : generating.clone();
    }

    private static boolean contains(int[] a, int v) {
        for (int x : a) if (x == v) return true;
        return false;
    }
}
