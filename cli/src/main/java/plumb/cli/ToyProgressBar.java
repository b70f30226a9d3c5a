package plumb.cli;

import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ConsoleProgressBarConsumer;

import java.util.function.IntConsumer;

/**
 * The toy commands' progress bar on standard error, fed by the engine's IntConsumer callbacks
 * (tasks finished so far). Hidden when standard error is not a terminal, so files and tests get
 * no control characters.
 */
final class ToyProgressBar implements IntConsumer, AutoCloseable {

    private final ProgressBar bar;

    /** A bar titled {@code task} expecting about {@code max} tasks (raised when exceeded). */
    ToyProgressBar(String task, long max) {
        bar = System.console() == null ? null : new ProgressBarBuilder().setTaskName(task).setInitialMax(max)
                .setConsumer(new ConsoleProgressBarConsumer(System.err)).setUpdateIntervalMillis(250).build();
    }

    @Override
    public synchronized void accept(int done) {
        if (bar == null) return;
        if (done > bar.getMax()) bar.maxHint(Math.max(done, bar.getMax() + bar.getMax() / 4));
        if (done > bar.getCurrent()) bar.stepTo(done);
    }

    @Override
    public void close() {
        if (bar != null) bar.close();
    }
}
