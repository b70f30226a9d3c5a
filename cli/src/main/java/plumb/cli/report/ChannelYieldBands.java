package plumb.cli.report;

import java.util.ArrayList;
import java.util.List;
import plumb.cli.plot.StackedYields;

/**
 * Pre-fit and post-fit yields of one channel (cli-contract.md, {@code plumb yields}).
 *
 * @param name         channel name
 * @param observable   x-axis title with units, or null
 * @param edges        bin edges (n + 1), or null
 * @param observed     the counts fitted, or null for a blinded channel
 * @param samples      every sample of the channel
 * @param totalPrefit  total expectation before the fit
 * @param totalPostfit total expectation after the fit, or null when no fit was made
 */
public record ChannelYieldBands(String name, String observable, double[] edges, double[] observed,
                            List<SampleBands> samples, BinBand totalPrefit, BinBand totalPostfit) {

    /** Per-bin yields with their uncertainties. */
    public record BinBand(double[] yields, double[] errors) {
        public BinBand {
            if (yields.length != errors.length) throw new IllegalArgumentException(yields.length + " yields but " + errors.length + " errors");
            yields = yields.clone();
            errors = errors.clone();
        }
    }

    /**
     * One sample.
     *
     * @param signal  true for a sample scaled by the parameter of interest
     * @param postfit null when no fit was made
     */
    public record SampleBands(String name, boolean signal, BinBand prefit, BinBand postfit) {
    }

    public ChannelYieldBands {
        samples = List.copyOf(samples);
        if (samples.isEmpty()) throw new IllegalArgumentException("channel " + name + " has no samples");
    }

    /** True when post-fit yields are present. */
    public boolean hasPostfit() {
        return totalPostfit != null;
    }

    /** Figure input for the pre-fit ({@code postfit} false) or post-fit stack. */
    public StackedYields stacked(boolean postfit) {
        List<StackedYields.Layer> layers = new ArrayList<>();
        for (SampleBands s : samples) layers.add(new StackedYields.Layer(s.name(), (postfit ? s.postfit() : s.prefit()).yields(), s.signal()));
        BinBand total = postfit ? totalPostfit : totalPrefit;
        return new StackedYields(name, postfit ? "post-fit" : "pre-fit", observable, edges, layers, total.errors(), observed);
    }

    /** Number of bins. */
    public int bins() {
        return totalPrefit.yields().length;
    }
}
