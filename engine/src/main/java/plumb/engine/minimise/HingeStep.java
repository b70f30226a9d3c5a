package plumb.engine.minimise;

import java.util.Arrays;

/**
 * A Newton step that sees the hinges of a {@link HingedObjective} it would cross.
 *
 * <p>Newton's quadratic model sees only the side of each hinge its point is on. Where a step
 * crosses into a valley (f rises beyond the kink by a_e·max(0, u_e)), f along the step rises
 * again after the kink, the line search shortens the step to the kink, and the next step crosses
 * back: many short steps. Here the model keeps the hinges the step crosses, to first order:
 * minimise m(d) = g₀ᵀd + ½dᵀHd + Σ_e a_e·max(0, u_e + ∇u_eᵀd), with g₀ the gradient without the
 * hinges counted at x. Since a·max(0, v) = max over t ∈ [0, 1] of t·a·v, the minimum is
 * d = −H⁻¹(g₀ + Σ_e t_e a_e ∇u_e) with t maximising the concave dual
 * −½(g₀ + Jt)ᵀH⁻¹(g₀ + Jt) + Σ_e t_e a_e u_e over the box [0, 1]^m (J's columns a_e∇u_e), found by
 * coordinate ascent. A hinge with t_e strictly inside (0, 1) is one the step stops on. Hinges the new
 * step crosses are added and the model solved again, a few rounds. The decrement reported is
 * 2·(m(0) − m(d)), the piecewise form of the Newton decrement gᵀH⁻¹g: at a minimum on kinks it
 * goes to zero while gᵀH⁻¹g does not.
 */
final class HingeStep {

    /** Rounds of (solve, add the hinges the new step crosses). */
    private static final int MAX_ROUNDS = 6;
    private static final int MAX_SWEEPS = 2000;
    /** Coordinate ascent stops when no t_e moves by more than this. */
    private static final double T_CHANGE = 1e-13;

    private final int n;
    private final Hinges hinges = new Hinges();
    /** Full index → position in the system's free set, −1 outside it. */
    private final int[] position;
    private final double[] g0;
    private final double[] z;
    private final double[] work;
    /** H⁻¹(a_e ∇u_e) over the free set, one row of length k per hinge. */
    private double[] y = new double[0];
    private double[] t = new double[0];
    /** 2·(m(0) − m(d)) of the last step. */
    double decrement;

    HingeStep(int n) {
        this.n = n;
        this.position = new int[n];
        this.g0 = new double[n];
        this.z = new double[n];
        this.work = new double[n];
    }

    /**
     * Replaces {@code step} (full length, zero off the free set) by the hinge model's step when the
     * step crosses a valley; the system holds the factored Hessian of the free set it was solved on.
     *
     * @return false (step unchanged) when the step crosses none
     */
    boolean apply(HingedObjective objective, ReducedSystem system, double[] x, double[] g, double[] step) {
        hinges.clear();
        objective.hingesAlong(x, step, hinges);
        if (hinges.size() == 0) {
            return false;
        }
        final int k = system.size;
        Arrays.fill(position, -1);
        for (int a = 0; a < k; a++) {
            position[system.index[a]] = a;
        }
        System.arraycopy(g, 0, g0, 0, n);
        int solved = 0;
        for (int round = 0; round < MAX_ROUNDS; round++) {
            final int m = hinges.size();
            if (y.length < m * k) {
                y = Arrays.copyOf(y, Math.max(m * k, 2 * y.length));
            }
            if (t.length < m) {
                t = Arrays.copyOf(t, Math.max(m, 2 * t.length));
            }
            for (int e = solved; e < m; e++) {
                final double a = hinges.slope(e);
                Arrays.fill(work, 0);
                for (int p = hinges.normalFrom(e); p < hinges.normalTo(e); p++) {
                    work[hinges.normalIndex(p)] += a * hinges.normalValue(p);
                }
                system.solve(work);
                System.arraycopy(system.solution, 0, y, e * k, k);
                // the step starts on the side x is on: counted in g where u_e ≥ 0
                final boolean counted = hinges.offset(e) >= 0;
                t[e] = counted ? 1 : 0;
                if (counted) {
                    for (int p = hinges.normalFrom(e); p < hinges.normalTo(e); p++) {
                        g0[hinges.normalIndex(p)] -= a * hinges.normalValue(p);
                    }
                }
            }
            solved = m;
            system.solve(g0);
            Arrays.fill(z, 0);
            System.arraycopy(system.solution, 0, z, 0, k);
            solveDual(m, k);
            Arrays.fill(step, 0);
            for (int a = 0; a < k; a++) {
                double v = z[a];
                for (int e = 0; e < m; e++) {
                    v += y[e * k + a] * t[e];
                }
                step[system.index[a]] = -v;
            }
            objective.hingesAlong(x, step, hinges);
            if (hinges.size() == m) {
                break;
            }
        }
        measure(system, step, solved);
        return true;
    }

    /** a_e ∇u_eᵀ v over the free set, v in system order. */
    private double slopeAlong(int e, double[] v, int offset) {
        double s = 0;
        for (int p = hinges.normalFrom(e); p < hinges.normalTo(e); p++) {
            final int at = position[hinges.normalIndex(p)];
            if (at >= 0) {
                s += hinges.normalValue(p) * v[offset + at];
            }
        }
        return hinges.slope(e) * s;
    }

    /** Coordinate ascent on the dual over t ∈ [0, 1]^m for the hinges solved so far. */
    private void solveDual(int m, int k) {
        final double[] q = new double[m * m];
        final double[] rhs = new double[m];
        for (int e = 0; e < m; e++) {
            for (int f = e; f < m; f++) {
                final double v = slopeAlong(e, y, f * k);
                q[e * m + f] = v;
                q[f * m + e] = v;
            }
            // ∂(dual)/∂t_e at t = 0: a_e u_e − a_e ∇u_eᵀ H⁻¹ g₀
            rhs[e] = hinges.slope(e) * hinges.offset(e) - slopeAlong(e, z, 0);
        }
        final double[] qt = new double[m];
        for (int e = 0; e < m; e++) {
            if (t[e] != 0) {
                for (int f = 0; f < m; f++) {
                    qt[f] += q[f * m + e] * t[e];
                }
            }
        }
        for (int sweep = 0; sweep < MAX_SWEEPS; sweep++) {
            double change = 0;
            for (int e = 0; e < m; e++) {
                final double qee = q[e * m + e];
                if (!(qee > 0)) {
                    continue; // the hinge does not move with the free variables
                }
                final double te = Math.min(1, Math.max(0, t[e] + (rhs[e] - qt[e]) / qee));
                final double dt = te - t[e];
                if (dt != 0) {
                    t[e] = te;
                    for (int f = 0; f < m; f++) {
                        qt[f] += q[f * m + e] * dt;
                    }
                    change = Math.max(change, Math.abs(dt));
                }
            }
            if (change < T_CHANGE) {
                break;
            }
        }
    }

    /** The decrement 2·(m(0) − m(d)) of the step. */
    private void measure(ReducedSystem system, double[] step, int solved) {
        final int m = hinges.size();
        // H d = −(g₀ + Jt) on the free set, so g₀ᵀd + ½dᵀHd = ½(g₀ᵀd − Σ t_e a_e ∇u_eᵀd).
        double model = 0;
        for (int a = 0; a < system.size; a++) {
            final int i = system.index[a];
            model += 0.5 * g0[i] * step[i];
        }
        for (int e = 0; e < m; e++) {
            final double along = hinges.along(e, step);
            final double a = hinges.slope(e), u = hinges.offset(e);
            model += a * (Math.max(0, u + along) - Math.max(0, u));
            if (e < solved) {
                model -= 0.5 * t[e] * a * along;
            } else if (u >= 0) {
                model -= a * along; // added after the last solve: still counted in g₀
            }
        }
        decrement = -2 * model;
    }
}
