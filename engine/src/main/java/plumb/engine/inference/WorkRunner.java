package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.io.Serializable;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * Where {@link RangeWork} runs: threads of this process ({@link #threads}), or a cluster (the
 * spark module). Results come back by index, so every runner gives the same results.
 */
public interface WorkRunner extends AutoCloseable {

    /**
     * Runs indices 0 .. count−1 of {@code work} on model {@code m} and returns their results by index.
     *
     * @param progress called with the number of indices finished so far (possibly from other
     *                 threads, possibly in steps of a whole task), or null
     */
    <W, R extends Serializable> List<R> run(CompiledModel m, RangeWork<W, R> work, int count, IntConsumer progress);

    /**
     * Runs {@code work} once per model, task i on {@code models.get(i)}, and returns the results
     * in the models' order.
     *
     * @param progress called with the number of models finished so far, or null
     */
    <R extends Serializable> List<R> runEach(List<CompiledModel> models, ModelWork<R> work, IntConsumer progress);

    /** Work on one model of several ({@link #runEach}): a serialisable description, as {@link RangeWork}. */
    interface ModelWork<R extends Serializable> extends Serializable {
        R run(CompiledModel m, int index);
    }

    /** Frees what the runner holds (a cluster connection); nothing for threads. */
    @Override
    default void close() {
    }

    /** A runner on {@code threads} threads of this process ({@link ParallelRunner}). */
    static WorkRunner threads(int threads) {
        return new WorkRunner() {
            @Override
            public <W, R extends Serializable> List<R> run(CompiledModel m, RangeWork<W, R> work, int count,
                                                           IntConsumer progress) {
                return ParallelRunner.run(count, threads, () -> work.worker(m), (w, i) -> work.run(w, m, i), progress);
            }

            @Override
            public <R extends Serializable> List<R> runEach(List<CompiledModel> models, ModelWork<R> work,
                                                            IntConsumer progress) {
                return ParallelRunner.run(models.size(), threads, () -> null, (w, i) -> work.run(models.get(i), i), progress);
            }
        };
    }
}
