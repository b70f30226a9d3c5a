package plumb.engine.inference;

import org.junit.jupiter.api.Test;

import java.time.Duration;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A worker's failure ends the whole run promptly, with that failure; nothing keeps running. */
class ParallelRunnerFailureTest {

    @Test
    void anErrorInOneWorkerStopsTheOthers() {
        AtomicInteger started = new AtomicInteger();
        OutOfMemoryError thrown = assertTimeoutPreemptively(Duration.ofSeconds(20), () -> assertThrows(OutOfMemoryError.class,
                () -> ParallelRunner.run(1_000_000, 2, () -> null, (w, i) -> {
                    started.incrementAndGet();
                    if (i == 10) throw new OutOfMemoryError("simulated");
                    try {
                        Thread.sleep(1);
                    } catch (InterruptedException e) {
                        Thread.currentThread().interrupt();
                    }
                    return i;
                }, null)));
        assertEquals("simulated", thrown.getMessage());
        // the other worker finishes at most the task it holds
        assertTrue(started.get() < 100, "tasks started: " + started.get());
    }

    @Test
    void aRuntimeFailureIsRethrownAsItself() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ParallelRunner.run(1000, 2, () -> null,
                (w, i) -> {
                    if (i == 3) throw new IllegalArgumentException("bad index");
                    return i;
                }, null));
        assertEquals("bad index", e.getMessage());
    }

    @Test
    void aCountWhoseResultsCannotFitIsRefusedBeforeAllocating() {
        MemoryBudget.TooLargeException e = assertThrows(MemoryBudget.TooLargeException.class,
                () -> ParallelRunner.run(Integer.MAX_VALUE, 2, () -> null, (w, i) -> i, null));
        assertTrue(e.getMessage().contains("heap limit"), e.getMessage());
        assertTrue(e.getMessage().contains("-Xmx"), e.getMessage());
    }

    @Test
    void fitterMatricesBeyondTheLargestArrayAreRefusedWithLongArithmetic() {
        MemoryBudget.TooLargeException e = assertThrows(MemoryBudget.TooLargeException.class,
                () -> MemoryBudget.requireFitter(65_536));
        assertTrue(e.getMessage().startsWith("a fit of 65536 parameters needs 65536×65536 matrices"), e.getMessage());
        // 20 000² · 8 · 14 bytes overflows an int many times over; as a long it is 41.7 GiB
        assertEquals(14L * 20_000 * 20_000 * 8 + 64L * 20_000 * 8, MemoryBudget.fitterBytes(20_000));
        assertEquals(Long.MAX_VALUE, MemoryBudget.times(Long.MAX_VALUE / 2, 3));
    }
}
