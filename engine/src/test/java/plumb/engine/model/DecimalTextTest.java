package plumb.engine.model;

import org.junit.jupiter.api.Test;

import java.util.Locale;
import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The fast path of number texts against the JDK's correctly rounded {@link Double#parseDouble}
 * (the reference): bit for bit wherever it gives a value, NaN (the full parser's turn) elsewhere,
 * and a value for the numbers models are written with.
 */
class DecimalTextTest {

    private static double exact(String text) {
        char[] padded = ("[" + text + ",").toCharArray();
        return DecimalText.exact(padded, 1, text.length());
    }

    private static void assertSameOrNaN(String text) {
        double fast = exact(text);
        if (Double.isNaN(fast)) return;
        assertEquals(Double.doubleToRawLongBits(Double.parseDouble(text)), Double.doubleToRawLongBits(fast), text);
    }

    @Test
    void agreesWithTheJdkBitForBit() {
        SplittableRandom r = new SplittableRandom(17);
        String[] formats = {"%.6g", "%.3f", "%.15g", "%.17g", "%.6e", "%.1e", "%.0f", "%.12f"};
        for (int i = 0; i < 200_000; i++) {
            double magnitude = Math.pow(10, r.nextInt(-30, 30));
            double x = (r.nextBoolean() ? -1 : 1) * r.nextDouble() * magnitude;
            String text = String.format(Locale.ROOT, formats[i % formats.length], x).replace("e+0", "e+").replace("e-0", "e-");
            assertSameOrNaN(text);
            assertSameOrNaN(Long.toString(r.nextLong(-1_000_000_000_000_000L, 1_000_000_000_000_000L)));
        }
        for (String t : new String[] {"0", "1", "-1", "0.0", "0e5", "1E22", "1e23", "9007199254740993", "123456789012345",
                "1234567890123456", "0.000001", "1.7976931348623157e308", "4.9e-324", "2.2250738585072014E-308",
                "0.1", "0.30000000000000004", "100000000000000000000000", "1e-22", "1e-23", "3.14159e+2"}) {
            assertSameOrNaN(t);
        }
    }

    @Test
    void takesTheNumbersOfAModelFile() {
        // six significant digits, as generated models and most histograms are written
        for (String t : new String[] {"58.4778", "0.0195146", "5.21647e-05", "113.865", "0.979863", "1", "0", "1e-10", "-2.5"}) {
            double fast = exact(t);
            assertTrue(!Double.isNaN(fast), t);
            assertEquals(Double.parseDouble(t), fast, 0.0, t);
        }
    }

    @Test
    void leavesTheRestToTheFullParser() {
        for (String t : new String[] {"-0", "-0.0", "1234567890123456789", "1e400", "1e-400", "12345.678901234567", ""}) {
            assertTrue(Double.isNaN(exact(t)), t);
        }
    }
}
