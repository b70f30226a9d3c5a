package plumb.cli;

import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;

import java.util.function.IntConsumer;

/**
 * A progress bar on standard error for long computations (refits, scan points, toys), shown only
 * when a terminal is attached ({@link System#console()} non-null), so files, pipes and tests see
 * nothing. Wraps me.tongfei:progressbar, a maintained library that handles terminal widths,
 * redraw rates and ETA, none of which is worth writing again. Use in try-with-resources; the
 * {@link #callback()} may be called from worker threads.
 */
public final class Progress implements AutoCloseable {

    private final ProgressBar bar;

    private Progress(ProgressBar bar) {
        this.bar = bar;
    }

    /** A bar for {@code total} steps named {@code task}; a silent one when not on a terminal. */
    public static Progress start(String task, long total) {
        if (System.console() == null || total <= 0) return new Progress(null);
        ProgressBar bar = new ProgressBarBuilder()
                .setTaskName(task)
                .setInitialMax(total)
                .setStyle(ProgressBarStyle.ASCII)
                .setConsumer(new ConsoleProgressBarConsumer(System.err))
                .setUpdateIntervalMillis(200)
                .clearDisplayOnFinish()
                .build();
        return new Progress(bar);
    }

    /**
     * Receives the number of finished steps (the engine's progress callback); the total grows when
     * an adaptive computation (toy CLs) runs more steps than first announced.
     */
    public IntConsumer callback() {
        if (bar == null) return done -> { };
        return done -> {
            synchronized (bar) {
                if (done > bar.getMax()) bar.maxHint(Math.max(done, bar.getMax() + bar.getMax() / 4));
                if (done > bar.getCurrent()) bar.stepTo(done);
            }
        };
    }

    @Override
    public void close() {
        if (bar != null) bar.close();
    }
}
