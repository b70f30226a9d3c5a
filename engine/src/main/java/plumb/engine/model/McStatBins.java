package plumb.engine.model;

import java.util.ArrayList;
import java.util.List;

/**
 * Which bins get an MC-statistics parameter γ_b, the one rule shared by the validator and the
 * compiler (docs/model-format.md, "MC-statistics term"). In a channel, the samples that give
 * {@code mcError} take part; for bin b, with sums over them,
 * δ_b = sqrt(Σ_s mcError_sb²) / Σ_s n_sb, and γ_b exists when δ_b &gt; {@code mcStatThreshold} and
 * Σ_s n_sb &gt; 0. It is named {@code mcstat:<channel>:<bin index from 0>}.
 *
 * <p>The methods assume a channel whose per-bin arrays agree in length ({@link ModelValidator}).
 *
 * @see <a href="https://doi.org/10.1016/0010-4655(93)90005-W">R. Barlow, C. Beeston, Comput. Phys.
 *      Commun. 77 (1993) 219</a>; J. S. Conway, arXiv:1103.0354
 */
public final class McStatBins {

    /** Prefix of every generated MC-statistics parameter name, reserved for them. */
    public static final String PREFIX = "mcstat:";

    private McStatBins() {
    }

    /** The name of the γ of {@code bin} in channel {@code channel}: {@code mcstat:<channel>:<bin>}. */
    public static String name(String channel, int bin) {
        return PREFIX + channel + ':' + bin;
    }

    /**
     * δ_b of {@code bin}: the relative MC-statistics error of the summed yields of the samples that
     * give {@code mcError}, or NaN when no sample gives it or their yields sum to 0 (no γ then).
     */
    public static double relativeError(Channel channel, int bin) {
        double sumSquares = 0, sumYields = 0;
        boolean any = false;
        for (Sample s : channel.samples()) {
            if (s.mcError() == null) continue;
            any = true;
            double e = s.mcError()[bin];
            sumSquares += e * e;
            sumYields += s.yields()[bin];
        }
        return any && sumYields > 0 ? Math.sqrt(sumSquares) / sumYields : Double.NaN;
    }

    /**
     * δ_b of every bin of {@code channel}, equal to {@link #relativeError} bin by bin (same
     * summation order), computed sample by sample so that each array is walked once in order.
     */
    public static double[] relativeErrors(Channel channel) {
        int bins = channel.bins();
        double[] sumSquares = new double[bins];
        double[] sumYields = new double[bins];
        boolean any = false;
        for (Sample s : channel.samples()) {
            double[] e = s.mcError();
            if (e == null) continue;
            any = true;
            double[] n = s.yields();
            for (int b = 0; b < bins; b++) {
                sumSquares[b] += e[b] * e[b];
                sumYields[b] += n[b];
            }
        }
        for (int b = 0; b < bins; b++) {
            sumSquares[b] = any && sumYields[b] > 0 ? Math.sqrt(sumSquares[b]) / sumYields[b] : Double.NaN;
        }
        return sumSquares;
    }

    /** Whether {@code bin} of {@code channel} gets a γ: δ_b &gt; mcStatThreshold (NaN never does). */
    public static boolean exists(Channel channel, int bin, ModelOptions options) {
        return relativeError(channel, bin) > options.mcStatThreshold();
    }

    /** The names of all generated γ parameters of the model, in channel order, then bin order. */
    public static List<String> names(Model model) {
        List<String> names = new ArrayList<>();
        for (Channel ch : model.channels()) {
            double[] delta = relativeErrors(ch);
            for (int b = 0; b < delta.length; b++) {
                if (delta[b] > model.options().mcStatThreshold()) names.add(name(ch.name(), b));
            }
        }
        return names;
    }
}
