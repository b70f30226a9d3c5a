package plumb.engine.model;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The kinds of parameter and their defaults (docs/model-format.md, "Parameters"); an entry of the
 * model's {@code parameters} overrides them.
 */
public enum ParameterKind {
    /** Used only in {@code factors}: value 1, range [0, 50], free. */
    FACTOR(1, 0, 50),
    /** A generated per-bin free factor ({@link BinFactors}): value 1, range [0, 50], free. */
    BIN_FACTOR(1, 0, 50),
    /** Used in a variation (perhaps also in {@code factors}): value 0, range [−6, 6], Gaussian(0, 1). */
    VARIATION(0, -6, 6),
    /** A generated MC-statistics γ_b ({@link McStatBins}): value 1, range [1e-8, 20]. */
    MC_STATISTICS(1, 1e-8, 20);

    private final double value;
    private final double low;
    private final double high;

    ParameterKind(double value, double low, double high) {
        this.value = value;
        this.low = low;
        this.high = high;
    }

    /** Default initial and nominal value. */
    public double defaultValue() {
        return value;
    }

    /** Default lower bound of the range. */
    public double defaultLow() {
        return low;
    }

    /** Default upper bound of the range. */
    public double defaultHigh() {
        return high;
    }

    /**
     * Every parameter of a validated model with its kind: the names in {@code factors} and
     * variations in order of first use (channel, sample, factors, per-bin factors, variations), then the
     * generated γ names of {@link McStatBins#names(Model)}. A name used both as a factor and in a
     * variation is {@link #VARIATION}.
     */
    public static Map<String, ParameterKind> of(Model model) {
        Map<String, ParameterKind> kinds = new LinkedHashMap<>();
        for (Channel ch : model.channels()) {
            for (Sample s : ch.samples()) {
                for (String f : s.factors()) kinds.putIfAbsent(f, FACTOR);
                if (s.binFactors() != null) {
                    for (int b = 0; b < s.yields().length; b++) {
                        if (BinFactors.active(s, b)) kinds.putIfAbsent(BinFactors.name(s.binFactors(), b), BIN_FACTOR);
                    }
                }
                for (Variation v : s.variations()) kinds.put(v.parameter(), VARIATION);
            }
        }
        for (String g : McStatBins.names(model)) kinds.putIfAbsent(g, MC_STATISTICS);
        return kinds;
    }
}
