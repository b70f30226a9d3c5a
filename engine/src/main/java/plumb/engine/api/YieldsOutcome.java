package plumb.engine.api;

import java.util.List;
import java.util.NoSuchElementException;

/**
 * Pre-fit and post-fit yields of every channel, summed over the channel's bins (per-bin values
 * are in {@link plumb.engine.inference.Yields}).
 */
public record YieldsOutcome(List<Channel> channels) {

    public YieldsOutcome {
        channels = List.copyOf(channels);
    }

    /** A sum over a channel's bins with its error (bin-to-bin correlations included). */
    public record Sum(double value, double error) { }

    /** One sample of a channel. */
    public record Sample(String name, Sum prefit, Sum postfit) { }

    /**
     * One channel.
     *
     * @param observed sum of the counts fitted, NaN for a channel the data leave out (blinded)
     */
    public record Channel(String name, double observed, List<Sample> samples, Sum totalPrefit, Sum totalPostfit) {
        public Channel {
            samples = List.copyOf(samples);
        }

        /** The named sample. */
        public Sample sample(String sampleName) {
            for (Sample s : samples) if (s.name().equals(sampleName)) return s;
            throw new NoSuchElementException("channel '" + name + "' has no sample '" + sampleName + "'");
        }
    }

    /** The named channel. */
    public Channel channel(String name) {
        for (Channel c : channels) if (c.name().equals(name)) return c;
        throw new NoSuchElementException("no channel '" + name + "'");
    }
}
