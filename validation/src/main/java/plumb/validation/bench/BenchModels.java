package plumb.validation.bench;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.models.SyntheticModels;

/** The generated models the benchmarks run on, by name (fixed seed: every run measures the same model). */
public final class BenchModels {

    /** Seed of every benchmark model. */
    public static final long SEED = 1;

    private BenchModels() {
    }

    /** "medium": 5 channels × 40 bins, 6 samples, 50 nuisances; "large": 20 × 50, 8 samples, 300. */
    public static CompiledModel compiled(String size) {
        return ModelCompiler.compile(switch (size) {
            case "medium" -> SyntheticModels.medium(SEED);
            case "large" -> SyntheticModels.large(SEED);
            default -> throw new IllegalArgumentException("unknown benchmark model size " + size);
        });
    }
}
