package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.minimise.MinimumStatus;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The toy-batch format and its merge rules. */
class InjectionToyBatchTest {

    private static final List<Double> INJECTED = List.of(1.0, 2.0);

    /** Toys first..first+count-1 of a run, values from (seed, index) only, like real toys. */
    private static InjectionToyBatch batch(long seed, long first, int count) {
        List<InjectionToyBatch.ValueFits> values = new java.util.ArrayList<>();
        for (double mu : INJECTED) {
            ToyFit[] fits = new ToyFit[count];
            for (int i = 0; i < count; i++) {
                long index = first + i;
                Random r = new Random(seed * 1_000_003 + index * 31 + (long) mu);
                boolean failed = index % 7 == 3;
                fits[i] = new ToyFit(index, failed ? MinimumStatus.values()[MinimumStatus.values().length - 1]
                        : MinimumStatus.CONVERGED, failed ? Double.NaN : mu + 0.3 * r.nextGaussian(),
                        failed ? Double.NaN : 0.3 + 0.01 * r.nextDouble(),
                        new double[] {r.nextGaussian(), index % 5 == 0 ? Double.NaN : r.nextGaussian() / 3});
            }
            values.add(new InjectionToyBatch.ValueFits(mu, fits));
        }
        var run = InjectionToyBatch.runIdentity("m", "abc", "mu", INJECTED, "nominal", true, seed, List.of("lumi=0.5"),
                FitSettings.defaults());
        return new InjectionToyBatch(run, Map.of("mass", 750.0), new String[] {"lumi", "bkg"}, first, count, values);
    }

    private static InjectionToyBatch roundTrip(InjectionToyBatch b, String name) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        b.write(out);
        return InjectionToyBatch.read(new ByteArrayInputStream(out.toByteArray()), name);
    }

    @Test
    void aWrittenBatchReadsBackBitForBit() throws IOException {
        InjectionToyBatch b = batch(4, 10, 12);
        InjectionToyBatch back = roundTrip(b, "part");
        assertEquals(b.run(), back.run());
        assertEquals(b.labels(), back.labels());
        assertArrayEquals(b.nuisances(), back.nuisances());
        assertEquals(10, back.first());
        assertEquals(12, back.count());
        for (int j = 0; j < INJECTED.size(); j++) {
            ToyFit[] a = b.injections().get(j).toys(), c = back.injections().get(j).toys();
            for (int i = 0; i < a.length; i++) {
                assertEquals(a[i].status(), c[i].status());
                // doubleToLongBits: equal bits, NaN for NaN
                assertEquals(Double.doubleToLongBits(a[i].poi()), Double.doubleToLongBits(c[i].poi()));
                assertEquals(Double.doubleToLongBits(a[i].poiError()), Double.doubleToLongBits(c[i].poiError()));
                for (int k = 0; k < 2; k++) {
                    assertEquals(Double.doubleToLongBits(a[i].nuisancePulls()[k]), Double.doubleToLongBits(c[i].nuisancePulls()[k]));
                }
            }
        }
    }

    @Test
    void mergedBatchesAreTheRunOfAllTheirToys() throws IOException {
        InjectionToyBatch whole = batch(4, 0, 30);
        // parts in any order
        InjectionToyBatch merged = InjectionToyBatch.merge(List.of(roundTrip(batch(4, 20, 10), "c"),
                roundTrip(batch(4, 0, 8), "a"), roundTrip(batch(4, 8, 12), "b")), List.of("c", "a", "b"));
        assertEquals(0, merged.first());
        assertEquals(30, merged.count());
        List<InjectionSummary> s1 = whole.summaries(), s2 = merged.summaries();
        for (int j = 0; j < s1.size(); j++) {
            assertEquals(s1.get(j).mean(), s2.get(j).mean(), 0);
            assertEquals(s1.get(j).pullWidth(), s2.get(j).pullWidth(), 0);
            assertEquals(s1.get(j).converged(), s2.get(j).converged());
            assertEquals(s1.get(j).nuisances().get(1).pullMean(), s2.get(j).nuisances().get(1).pullMean(), 0);
        }
    }

    @Test
    void overlapsGapsAndOtherRunsAreRefusedNamingTheParts() {
        InjectionToyBatch.BadBatch overlap = assertThrows(InjectionToyBatch.BadBatch.class,
                () -> InjectionToyBatch.merge(List.of(batch(4, 0, 10), batch(4, 5, 10)), List.of("a", "b")));
        assertEquals("b: toys 5..14 overlap toys of a", overlap.getMessage());
        InjectionToyBatch.BadBatch gap = assertThrows(InjectionToyBatch.BadBatch.class,
                () -> InjectionToyBatch.merge(List.of(batch(4, 12, 3), batch(4, 0, 10)), List.of("late", "early")));
        assertEquals("late: starts at toy 12 but the parts before end at toy 9 (toys 10..11 missing)", gap.getMessage());
        InjectionToyBatch.BadBatch other = assertThrows(InjectionToyBatch.BadBatch.class,
                () -> InjectionToyBatch.merge(List.of(batch(4, 0, 10), batch(5, 10, 10)), List.of("a", "b")));
        assertEquals("b: a different run than a (run.seed differs)", other.getMessage());
    }

    @Test
    void brokenPartsAreRefusedWithTheirJsonPath() throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        batch(4, 0, 3).write(out);
        String text = out.toString(StandardCharsets.UTF_8);
        String wrongIndex = text.replaceFirst("\"index\" ?: ?1,", "\"index\":7,");
        InjectionToyBatch.BadBatch e = assertThrows(InjectionToyBatch.BadBatch.class, () -> InjectionToyBatch.read(
                new ByteArrayInputStream(wrongIndex.getBytes(StandardCharsets.UTF_8)), "p.json"));
        assertEquals("p.json: injections[0].toys[1].index 7, expected 1", e.getMessage());
        String notBatch = text.replace(InjectionToyBatch.FORMAT, "something/1");
        e = assertThrows(InjectionToyBatch.BadBatch.class, () -> InjectionToyBatch.read(
                new ByteArrayInputStream(notBatch.getBytes(StandardCharsets.UTF_8)), "p.json"));
        assertTrue(e.getMessage().startsWith("p.json: format is not"), e.getMessage());
        assertEquals("format", e.path());
    }
}
