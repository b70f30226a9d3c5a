package plumb.engine.minimise;

/**
 * An objective with hinge kinks: near x it is, to first order, a smooth part plus
 * Σ_e a_e·max(0, u_e(x)) over some terms e, so its derivatives jump where a u_e crosses zero
 * (the clip of a sample's yield at zero in a likelihood). Minimisers that know the hinges can take
 * steps that stop on them instead of crossing back and forth ({@link BoundedNewton}).
 */
public interface HingedObjective extends Objective {

    /**
     * Adds to {@code out} the hinges with a positive slope a_e (a valley: f rises beyond the kink)
     * whose u_e the step from x to x + d changes sign, to first order in d, and that {@code out}
     * does not hold yet. The gradient at x contains a_e·∇u_e for those with u_e ≥ 0.
     */
    void hingesAlong(double[] x, double[] d, Hinges out);
}
