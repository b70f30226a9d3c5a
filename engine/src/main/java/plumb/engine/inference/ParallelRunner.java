package plumb.engine.inference;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.IntConsumer;
import java.util.function.Supplier;

/**
 * Runs many independent tasks (refits, toys, scan points) on a few threads. Each thread gets its
 * own worker (a {@link Fitter}, say) from the factory; tasks are taken in any order and results
 * stored by index, so the outcome does not depend on the thread count as long as each task
 * depends only on its index (warm-start every refit from the same point, never from the previous
 * task on the same thread).
 */
public final class ParallelRunner {

    private ParallelRunner() {
    }

    /** Bytes a task's result is assumed to take at least: its slot and a small record. */
    static final long SLOT_BYTES = 64;

    /** A task: computes the result of one index with the thread's worker. */
    @FunctionalInterface
    public interface Task<W, R> {
        R run(W worker, int index);
    }

    /**
     * Runs tasks 0 .. count−1 and returns their results by index.
     *
     * @param progress called once per finished task (from worker threads), or null
     */
    public static <W, R> List<R> run(int count, int threads, Supplier<W> workers, Task<W, R> task, IntConsumer progress) {
        MemoryBudget.require(MemoryBudget.times(count, SLOT_BYTES), String.format(java.util.Locale.ROOT,
                "keeping the results of %d tasks", count));
        Object[] results = new Object[count];
        int n = Math.max(1, Math.min(threads, count));
        AtomicInteger next = new AtomicInteger();
        AtomicInteger done = new AtomicInteger();
        Runnable loop = () -> {
            try {
                W worker = workers.get();
                for (int i; (i = next.getAndIncrement()) < count; ) {
                    results[i] = task.run(worker, i);
                    if (progress != null) progress.accept(done.incrementAndGet());
                }
            } catch (Throwable failure) {
                // a failed worker (an OutOfMemoryError included) stops the others: no task is
                // handed out after it, so the run ends with its failure instead of going on
                next.set(count);
                throw failure;
            }
        };
        if (n == 1) {
            loop.run();
        } else {
            ExecutorService pool = Executors.newFixedThreadPool(n, r -> {
                Thread t = new Thread(r, "plumb-worker");
                t.setDaemon(true);
                return t;
            });
            try {
                List<Future<?>> futures = new ArrayList<>();
                for (int t = 0; t < n; t++) futures.add(pool.submit(loop));
                for (Future<?> f : futures) f.get();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted", e);
            } catch (ExecutionException e) {
                if (e.getCause() instanceof RuntimeException re) throw re;
                if (e.getCause() instanceof Error error) throw error;
                throw new IllegalStateException(e.getCause());
            } finally {
                pool.shutdownNow();
            }
        }
        List<R> out = new ArrayList<>(count);
        for (Object o : results) {
            @SuppressWarnings("unchecked") R r = (R) o;
            out.add(r);
        }
        return out;
    }
}
