package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.io.Serializable;

/**
 * Work over the indices 0 .. count−1 of a computation (toys, refits), described by plain
 * serialisable values so that it can run in this process or be shipped to a cluster's executors
 * ({@link WorkRunner}). The model is not part of the description: the runner supplies it (in a
 * cluster, compiled once per executor from the broadcast bytes).
 *
 * <p>The result of index i must depend only on i and the description, never on which worker ran
 * it or what it ran before: that is what makes a run independent of threads, batches, task
 * boundaries and retries.
 *
 * @param <W> the per-thread (or per-task) worker, a {@link Fitter} say; never shipped
 * @param <R> the compact result of one index, shipped back from a cluster
 */
public interface RangeWork<W, R extends Serializable> extends Serializable {

    /** A fresh worker for one thread or one task. */
    W worker(CompiledModel m);

    /** The result of index {@code index} computed with {@code worker}. */
    R run(W worker, CompiledModel m, int index);
}
