package plumb.engine.model;

import java.util.LinkedHashSet;
import java.util.Set;

/**
 * Per-bin free factors (docs/model-format.md, "Per-bin free factors"): a sample with
 * {@code "binFactors": "B"} is multiplied in bin b by the free parameter {@code B:b} (bin index from
 * 0). Samples in several channels that give the same B share these parameters bin by bin, so a
 * control region's data fixes a background bin by bin and a signal region sees it times its own
 * yields and norm variations (a transfer factor). A bin in which every such sample has yield 0 gets
 * no parameter: nothing would constrain it.
 */
public final class BinFactors {

    private BinFactors() {
    }

    /** The parameter of bin {@code bin} of the factors named {@code base}: {@code base:bin}. */
    public static String name(String base, int bin) {
        return base + ':' + bin;
    }

    /** Whether the sample's bin gets a factor when no other sample sharing the base has a yield there. */
    public static boolean active(Sample s, int bin) {
        return s.binFactors() != null && s.yields()[bin] > 0;
    }

    /**
     * Every generated per-bin factor of the model, in order of first use (channel, sample, bin).
     * A name is generated when some sample with that base has a yield &gt; 0 in that bin.
     */
    public static Set<String> names(Model model) {
        Set<String> names = new LinkedHashSet<>();
        for (Channel ch : model.channels()) {
            for (Sample s : ch.samples()) {
                if (s.binFactors() == null || s.yields() == null) continue;
                for (int b = 0; b < s.yields().length; b++) if (s.yields()[b] > 0) names.add(name(s.binFactors(), b));
            }
        }
        return names;
    }
}
