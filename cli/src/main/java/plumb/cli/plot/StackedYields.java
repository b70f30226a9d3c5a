package plumb.cli.plot;

import java.util.List;
import java.util.Locale;

/**
 * Input of the stacked-yields figure of one channel at one stage of the fit.
 *
 * @param channel    channel name (shown in the title)
 * @param stage      "pre-fit" or "post-fit" (free text, shown in the title)
 * @param observable x-axis title with units, e.g. "m(γγ) [GeV]"; null when the model has none
 * @param edges      n + 1 strictly increasing bin edges, or null to number the bins 0..n−1
 * @param layers     samples, bottom of the stack first; signal layers are drawn on top
 * @param totalError per-bin uncertainty of the total expectation (n values, ≥ 0)
 * @param observed   per-bin observed counts (n values), or null for a blinded channel
 */
public record StackedYields(String channel, String stage, String observable, double[] edges,
                            List<Layer> layers, double[] totalError, double[] observed) {

    /**
     * One sample of the stack.
     *
     * @param name   sample name (legend)
     * @param yields expected yield per bin (n values, ≥ 0)
     * @param signal true for the sample scaled by the parameter of interest
     */
    public record Layer(String name, double[] yields, boolean signal) {
        public Layer {
            if (name == null || yields == null) throw new IllegalArgumentException("layer needs a name and yields");
            yields = yields.clone();
        }
    }

    public StackedYields {
        if (layers == null || layers.isEmpty()) throw new IllegalArgumentException("channel " + channel + " has no samples to stack");
        layers = List.copyOf(layers);
        int n = layers.get(0).yields().length;
        if (n == 0) throw new IllegalArgumentException("channel " + channel + " has no bins");
        for (Layer layer : layers) {
            requireBins(layer.yields(), n, "yields of " + layer.name());
            for (double y : layer.yields()) {
                if (!(y >= 0) || Double.isInfinite(y)) throw new IllegalArgumentException("yield " + y + " of " + layer.name() + " is not finite and >= 0");
            }
        }
        if (totalError != null) requireBins(totalError, n, "totalError");
        if (observed != null) requireBins(observed, n, "observed");
        if (edges != null) {
            if (edges.length != n + 1) throw new IllegalArgumentException(String.format(Locale.ROOT, "%d edges for %d bins", edges.length, n));
            for (int i = 1; i < edges.length; i++) {
                if (!(edges[i] > edges[i - 1])) throw new IllegalArgumentException("edges are not strictly increasing at " + i);
            }
        }
        edges = edges == null ? null : edges.clone();
        totalError = totalError == null ? new double[n] : totalError.clone();
        observed = observed == null ? null : observed.clone();
    }

    private static void requireBins(double[] a, int n, String what) {
        if (a.length != n) throw new IllegalArgumentException(String.format(Locale.ROOT, "%s has %d values, expected %d", what, a.length, n));
    }

    /** Number of bins. */
    public int bins() {
        return layers.get(0).yields().length;
    }

    /** Sum of all layers per bin. */
    public double[] total() {
        double[] t = new double[bins()];
        for (Layer layer : layers) for (int b = 0; b < t.length; b++) t[b] += layer.yields()[b];
        return t;
    }

    /** Lower edge of bin b (bin index when there are no edges). */
    public double low(int b) {
        return edges == null ? b - 0.5 : edges[b];
    }

    /** Upper edge of bin b. */
    public double high(int b) {
        return edges == null ? b + 0.5 : edges[b + 1];
    }
}
