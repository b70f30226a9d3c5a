package plumb.engine.model;

import java.util.List;

/**
 * One binned channel. {@code edges} (n+1 values) and {@code observed} (n values) may be null:
 * without edges bins are numbered, without observed counts the channel is blinded.
 */
public record Channel(String name, String observable, double[] edges, double[] observed,
                      List<Sample> samples) {

    public Channel {
        samples = List.copyOf(samples);
    }

    /** Number of bins, fixed by edges, then observed, then the first sample's yields. */
    public int bins() {
        if (edges != null) return edges.length - 1;
        if (observed != null) return observed.length;
        return samples.get(0).yields().length;
    }

    public boolean blinded() {
        return observed == null;
    }

    public Channel withObserved(double[] counts) {
        return new Channel(name, observable, edges, counts, samples);
    }
}
