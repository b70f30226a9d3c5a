package plumb.engine.inference;

import plumb.engine.minimise.MinimiserOptions;

/**
 * How fits are made.
 *
 * @param explicitGamma keep the MC-statistics γ_b as ordinary variables instead of solving them in
 *     closed form inside each evaluation (a cross-check: both give the same minimum)
 * @param optimizer which minimiser
 * @param options the minimiser's settings
 */
public record FitSettings(boolean explicitGamma, Optimizer optimizer, MinimiserOptions options)
        implements java.io.Serializable {

    /** The minimisers a fit can use. */
    public enum Optimizer {
        /** Bounded Newton with the analytic Hessian: the default. */
        NEWTON,
        /** commons-math BOBYQA, derivative-free: the independent cross-check and speed baseline. */
        REFERENCE
    }

    public static FitSettings defaults() {
        return new FitSettings(false, Optimizer.NEWTON, MinimiserOptions.defaults());
    }

    public FitSettings withExplicitGamma(boolean value) {
        return new FitSettings(value, optimizer, options);
    }

    public FitSettings withOptimizer(Optimizer value) {
        return new FitSettings(explicitGamma, value, options);
    }
}
