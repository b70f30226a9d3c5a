package plumb.engine.api;

import java.util.List;
import java.util.NoSuchElementException;

/**
 * Pre-fit and post-fit yields of every channel, summed over the channel's bins (per-bin values
 * are in {@link plumb.engine.inference.Yields}).
 */
public record YieldsOutcome(List<ChannelSums> channels) {

    public YieldsOutcome {
        channels = List.copyOf(channels);
    }

    /** A sum over a channel's bins with its error (bin-to-bin correlations included). */
    public record Sum(double value, double error) { }

    /** One sample of a channel. */
    public record SampleSums(String name, Sum prefit, Sum postfit) { }

    /**
     * One channel.
     *
     * @param observed sum of the counts fitted, NaN for a channel the data leave out (blinded)
     */
    public record ChannelSums(String name, double observed, List<SampleSums> samples, Sum totalPrefit, Sum totalPostfit) {
        public ChannelSums {
            samples = List.copyOf(samples);
        }

        /** The named sample. */
        public SampleSums sample(String sampleName) {
            for (SampleSums s : samples) if (s.name().equals(sampleName)) return s;
            throw new NoSuchElementException("channel '" + name + "' has no sample '" + sampleName + "'");
        }
    }

    /** The named channel. */
    public ChannelSums channel(String name) {
        for (ChannelSums c : channels) if (c.name().equals(name)) return c;
        throw new NoSuchElementException("no channel '" + name + "'");
    }
}
