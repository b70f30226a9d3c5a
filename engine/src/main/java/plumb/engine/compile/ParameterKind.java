package plumb.engine.compile;

/** How a parameter enters the model, which fixes its defaults (docs/model-format.md). */
public enum ParameterKind {
    /** Used only in {@code factors}: value 1, range [0, 10], free. */
    FACTOR,
    /** Used in a variation: value 0, range [−5, 5], Gaussian(0, 1). */
    NUISANCE,
    /** A per-bin MC-statistics parameter γ_b: value 1, range [1e-10, 10], constrained by δ_b. */
    MCSTAT
}
