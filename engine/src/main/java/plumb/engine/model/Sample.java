package plumb.engine.model;

import java.util.List;

/**
 * One sample of a channel: nominal yields per bin, optional MC-statistics errors, the names of the
 * parameters that multiply it ({@code factors}), the base name of its per-bin free factors
 * ({@code binFactors}, null when absent; see {@link BinFactors}) and its systematic variations.
 */
public record Sample(String name, double[] yields, double[] mcError, List<String> factors,
                     List<Variation> variations, String binFactors) {

    public Sample {
        factors = factors == null ? List.of() : List.copyOf(factors);
        variations = variations == null ? List.of() : List.copyOf(variations);
    }

    /** A sample without per-bin free factors. */
    public Sample(String name, double[] yields, double[] mcError, List<String> factors, List<Variation> variations) {
        this(name, yields, mcError, factors, variations, null);
    }

    /** The same sample with other variations. */
    public Sample withVariations(List<Variation> newVariations) {
        return new Sample(name, yields, mcError, factors, newVariations, binFactors);
    }
}
