package plumb.cli;

import me.tongfei.progressbar.DelegatingProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;

import java.io.PrintWriter;

/**
 * A progress bar on standard error for long runs (toys, scans, impacts), drawn by the progressbar
 * library (it keeps the rate and time estimate, and redraws from its own thread). Shown only when
 * standard error is a terminal ({@code System.console() != null}): piped output and tests see nothing.
 * {@link #step()} may be called from any thread.
 */
public final class Progress implements AutoCloseable {

    private static final int WIDTH = 100;

    private final ProgressBar bar;
    private final PrintWriter err;

    private Progress(ProgressBar bar, PrintWriter err) {
        this.bar = bar;
        this.err = err;
    }

    /** Starts a bar of {@code total} steps labelled {@code label}; a silent one when not on a terminal. */
    public static Progress start(String label, long total, PrintWriter err) {
        if (System.console() == null || total <= 0) return new Progress(null, err);
        ProgressBar bar = new ProgressBarBuilder()
                .setTaskName(label)
                .setInitialMax(total)
                .setUpdateIntervalMillis(250)
                .setConsumer(new DelegatingProgressBarConsumer(line -> {
                    err.print('\r');
                    err.print(line);
                    err.flush();
                }, WIDTH))
                .build();
        return new Progress(bar, err);
    }

    /** One step done. */
    public void step() {
        if (bar != null) bar.step();
    }

    @Override
    public void close() {
        if (bar != null) {
            bar.close();
            err.println();
            err.flush();
        }
    }
}
