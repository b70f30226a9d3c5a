package plumb.engine.linalg;

import java.util.concurrent.ForkJoinTask;

/**
 * Runs two pieces of work side by side: the second on the common fork-join pool, the first on the
 * calling thread, then waits for both. When no pool thread has picked the second piece up by then
 * (a busy machine, or a pool without threads), the caller runs it itself, so this never waits on
 * a thread that is not coming. Each piece's work is fixed by the caller, never by which thread
 * runs it, so results do not depend on timing.
 */
public final class TwoWay {

    /** Whether a second core exists to use; on one core both pieces run in the caller. */
    private static final boolean PARALLEL = Runtime.getRuntime().availableProcessors() > 1;

    private TwoWay() {
    }

    /** Runs {@code first} here and {@code second} beside it; returns when both are done. */
    public static void run(Runnable first, Runnable second) {
        if (!PARALLEL) {
            first.run();
            second.run();
            return;
        }
        ForkJoinTask<?> other = ForkJoinTask.adapt(second).fork();
        try {
            first.run();
        } finally {
            other.join();
        }
    }
}
