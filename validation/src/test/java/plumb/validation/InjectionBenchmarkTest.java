package plumb.validation;

import org.junit.jupiter.api.Test;
import plumb.engine.inference.InjectionSummary;
import plumb.validation.bench.InjectionBenchmark;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The injection benchmark measures what it says: 1,000 toys of the medium model at μ = 1, summarised. */
class InjectionBenchmarkTest {

    @Test
    void oneShotFitsAThousandToysAtMuOne() {
        InjectionBenchmark b = new InjectionBenchmark();
        b.threads = 2;
        b.setup();
        InjectionSummary s = b.thousandToys();
        assertEquals(InjectionBenchmark.TOYS, s.toys());
        assertEquals(1.0, s.injected());
        assertTrue(s.converged() >= 0.95 * InjectionBenchmark.TOYS);
        // the toys are real fits around μ = 1: the mean fitted POI is within 5 errors of it
        assertEquals(1.0, s.mean(), 5 * s.meanError());
    }
}
