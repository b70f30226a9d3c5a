package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

/**
 * How far a fit moved each constrained parameter from its pre-fit value, and how much the data
 * narrowed it, both in units of the pre-fit width (common practice in reporting fits with
 * nuisance parameters). NaN for free parameters, which have no pre-fit width.
 */
public final class Pulls {

    private Pulls() {
    }

    /** (value − pre-fit value)/pre-fit width of parameter i. */
    public static double pull(CompiledModel m, FitResult r, int i) {
        return (r.values()[i] - m.nominal(i)) / m.prefitWidth(i);
    }

    /** Post-fit error / pre-fit width of parameter i. */
    public static double constraint(CompiledModel m, FitResult r, int i) {
        return r.errors()[i] / m.prefitWidth(i);
    }
}
