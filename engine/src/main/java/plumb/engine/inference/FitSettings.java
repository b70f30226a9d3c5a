package plumb.engine.inference;

import plumb.engine.minimise.MinimiserOptions;

/**
 * How fits are made.
 *
 * @param explicitGamma keep the MC-statistics γ_b as ordinary variables instead of solving them in
 *     closed form inside each evaluation (a cross-check: both give the same minimum)
 * @param minimiser which minimiser
 * @param options the minimiser's settings
 */
public record FitSettings(boolean explicitGamma, MinimiserKind minimiser, MinimiserOptions options)
        implements java.io.Serializable {

    /** The minimisers a fit can use (the command line's {@code --optimizer} option names them). */
    public enum MinimiserKind {
        /** Bounded Newton with the analytic Hessian: the default. */
        NEWTON,
        /** Bounded quasi-Newton (BFGS) on gradients; the exact Hessian only confirms the minimum. */
        BFGS,
        /** commons-math BOBYQA, derivative-free: the independent cross-check and speed baseline. */
        REFERENCE
    }

    public static FitSettings defaults() {
        return new FitSettings(false, MinimiserKind.NEWTON, MinimiserOptions.defaults());
    }

    public FitSettings withExplicitGamma(boolean value) {
        return new FitSettings(value, minimiser, options);
    }

    public FitSettings withMinimiser(MinimiserKind value) {
        return new FitSettings(explicitGamma, value, options);
    }
}
