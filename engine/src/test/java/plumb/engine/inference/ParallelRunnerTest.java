package plumb.engine.inference;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Results by index whatever the threads; one worker per thread; failures surface. */
class ParallelRunnerTest {

    @Test
    void resultsAreInIndexOrderForAnyThreadCount() {
        for (int threads : new int[] {1, 2, 3, 8}) {
            List<Integer> r = ParallelRunner.run(50, threads, () -> null, (w, i) -> i * i, null);
            assertEquals(50, r.size());
            for (int i = 0; i < 50; i++) assertEquals(i * i, r.get(i), "threads " + threads);
        }
    }

    @Test
    void eachThreadMakesOneWorkerAndProgressCountsEveryTask() {
        AtomicInteger workers = new AtomicInteger();
        List<Integer> seen = Collections.synchronizedList(new ArrayList<>());
        List<int[]> r = ParallelRunner.run(40, 3, () -> new int[] {workers.incrementAndGet()}, (w, i) -> w, seen::add);
        assertTrue(workers.get() >= 1 && workers.get() <= 3, "workers " + workers.get());
        assertEquals(40, seen.size());
        assertEquals(40, Collections.max(seen));
        // every task ran with a worker made by one of the threads (a thread that finds no task left made one too)
        long distinct = r.stream().distinct().count();
        assertTrue(distinct >= 1 && distinct <= workers.get(), distinct + " workers used, " + workers.get() + " made");
        for (int[] w : r) assertTrue(w[0] >= 1 && w[0] <= workers.get());
    }

    @Test
    void aFailingTaskThrowsItsOwnException() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ParallelRunner.run(10, 2,
                () -> null, (w, i) -> {
                    if (i == 7) throw new IllegalArgumentException("task 7");
                    return i;
                }, null));
        assertEquals("task 7", e.getMessage());
    }

    @Test
    void noTasksGiveAnEmptyList() {
        assertEquals(List.of(), ParallelRunner.run(0, 4, () -> null, (w, i) -> i, null));
    }
}
