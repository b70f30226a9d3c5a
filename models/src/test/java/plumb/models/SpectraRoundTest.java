package plumb.models;

import org.junit.jupiter.api.Test;

import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The fast six-digit rounding against exact decimal arithmetic (BigDecimal, half-even), bit for bit. */
class SpectraRoundTest {

    @Test
    void equalsExactDecimalRoundingBitForBit() {
        SplittableRandom r = new SplittableRandom(42);
        for (int i = 0; i < 500_000; i++) {
            // magnitudes over 10^-12 .. 10^12, and both signs
            double x = (r.nextBoolean() ? 1 : -1) * Math.pow(10, r.nextDouble(-12, 12));
            assertEquals(Spectra.exactRound(x), Spectra.round(x), 0.0, () -> "x = " + x);
        }
    }

    @Test
    void tiesPowersOfTenAndShortValuesAreExact() {
        double[] cases = {0.5, 1.5, 2.5, 1234565, 1234575, 123456.5, 123457.5, 0.1234565, 1e5, 1e6, 999999.5,
            9999995, 99999.95, 1e-7, 1e22, 1e23, 3e-300, Double.MIN_VALUE, Double.MAX_VALUE, 0.1, 0.3, 123.456,
            -0.0, 0.0, 7.0, 1.0000005, 0.9999995};
        for (double x : cases) {
            assertEquals(Spectra.exactRound(x), Spectra.round(x), 0.0, () -> "x = " + x);
            double next = Math.nextUp(x), prev = Math.nextDown(x);
            assertEquals(Spectra.exactRound(next), Spectra.round(next), 0.0, () -> "x = " + next);
            assertEquals(Spectra.exactRound(prev), Spectra.round(prev), 0.0, () -> "x = " + prev);
        }
    }
}
