package plumb.engine.model;

/**
 * One entry of the model's {@code parameters}: overrides of a parameter's defaults. Every field but
 * {@code name} is null when absent from the file. {@code constraintGiven} tells an explicit
 * {@code "constraint": null} (a free parameter) from an absent key (keep the default).
 *
 * @param range two values {lo, hi} or null
 */
public record ParameterSpec(String name, Double value, double[] range, Boolean fixed,
                            Constraint constraint, boolean constraintGiven) {

    /** A constraint term of a parameter. */
    public sealed interface Constraint permits Gaussian, Poisson { }

    /** Gaussian constraint; a null center means the parameter's value, a null width means 1. */
    public record Gaussian(Double center, Double width) implements Constraint { }

    /** Poisson constraint of a multiplicative parameter: τ = 1/relative², auxiliary count m = τ. */
    public record Poisson(double relative) implements Constraint { }
}
