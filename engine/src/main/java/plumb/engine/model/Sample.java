package plumb.engine.model;

import java.util.List;

/**
 * One sample of a channel: nominal yields per bin, optional MC-statistics errors, the names of the
 * parameters that multiply it ({@code factors}) and its systematic variations.
 */
public record Sample(String name, double[] yields, double[] mcError, List<String> factors,
                     List<Variation> variations) {

    public Sample {
        factors = factors == null ? List.of() : List.copyOf(factors);
        variations = variations == null ? List.of() : List.copyOf(variations);
    }
}
