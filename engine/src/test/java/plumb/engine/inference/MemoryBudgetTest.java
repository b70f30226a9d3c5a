package plumb.engine.inference;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The heap policy of toys and scan points: how many results a computation may keep. */
class MemoryBudgetTest {

    @Test
    void injectionToysNeedTheirFitsTimesTheInjectedValues() {
        // 10 toys x 3 values x (96 + 16 + 8·4) bytes = 4320 bytes: nothing for any heap.
        assertDoesNotThrow(() -> MemoryBudget.requireInjectionToys(10, 3, 4, "--toys 10", "run fewer"));
        // 2^40 toys x 4 values of 8·1000-byte pull arrays: about 32 PB, more than any heap; the
        // message names the request, its size, the advice, then the -Xmx advice.
        MemoryBudget.TooLargeException e = assertThrows(MemoryBudget.TooLargeException.class,
                () -> MemoryBudget.requireInjectionToys(1L << 40, 4, 1000, "--toys 1099511627776", "run batches"));
        assertTrue(e.getMessage().startsWith("--toys 1099511627776 needs about "), e.getMessage());
        assertTrue(e.getMessage().contains("heap limit") && e.getMessage().contains("; run batches, or give Java more with -Xmx"),
                e.getMessage());
    }

    @Test
    void productsThatOverflowAreRefusedNotWrapped() {
        assertEquals(Long.MAX_VALUE, MemoryBudget.times(Long.MAX_VALUE / 2, 3));
        MemoryBudget.TooLargeException e = assertThrows(MemoryBudget.TooLargeException.class,
                () -> MemoryBudget.requireInjectionToys(Long.MAX_VALUE / 2, 3, 10, "toys", null));
        assertTrue(e.getMessage().contains("; give Java more with -Xmx"), e.getMessage());
    }
}
