package plumb.engine.model;

/**
 * The value of a JSON number's text when one exact operation gives it: a significand w of at
 * most 15 digits (below 2⁵³, so exact as a double) times or over 10^k with k ≤ 22 (also exact),
 * whose single correctly rounded product or quotient is the correctly rounded value of the text
 * (Clinger's fast path, common practice). A model's numbers (yields, variations written with a
 * few significant digits) nearly all qualify, and this reads them several times faster than a
 * general parser; any other text gives NaN, and the caller parses it in full.
 */
final class DecimalText {

    private static final double[] POWERS = {
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
        1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};

    private static final int MAX_DIGITS = 15;

    private DecimalText() {
    }

    /**
     * The value of the JSON number text c[off .. off+len), or NaN when the fast path does not
     * apply (too many digits, a large exponent, or anything but the JSON number grammar's
     * characters).
     */
    static double exact(char[] c, int off, int len) {
        int i = off;
        final int end = off + len;
        if (i == end) return Double.NaN;
        boolean negative = c[i] == '-';
        if (negative) i++;
        long w = 0;
        int digits = 0;      // significant digits taken into w (leading zeros not counted)
        int scale = 0;       // digits after the decimal point taken into w
        boolean any = false, point = false;
        for (; i < end; i++) {
            final char ch = c[i];
            if (ch >= '0' && ch <= '9') {
                any = true;
                if (w == 0 && ch == '0') {
                    if (point) scale++;
                    continue;
                }
                if (++digits > MAX_DIGITS) return Double.NaN;
                w = 10 * w + (ch - '0');
                if (point) scale++;
            } else if (ch == '.' && !point) {
                point = true;
            } else {
                break;
            }
        }
        if (!any) return Double.NaN;
        int exponent = 0;
        if (i < end) {
            final char e = c[i];
            if (e != 'e' && e != 'E') return Double.NaN;
            i++;
            boolean minus = false;
            if (i < end && (c[i] == '+' || c[i] == '-')) minus = c[i++] == '-';
            if (i == end) return Double.NaN;
            for (; i < end; i++) {
                final char ch = c[i];
                if (ch < '0' || ch > '9' || exponent > 1000) return Double.NaN;
                exponent = 10 * exponent + (ch - '0');
            }
            if (minus) exponent = -exponent;
        }
        double v;
        if (w == 0) {
            // "-0" is an integer token, read as +0.0, "-0.0" a float one, read as −0.0: leave both to the parser
            if (negative) return Double.NaN;
            v = 0;
        } else {
            final int k = exponent - scale;
            if (k >= 0 && k < POWERS.length) v = w * POWERS[k];
            else if (k < 0 && -k < POWERS.length) v = w / POWERS[-k];
            else return Double.NaN;
        }
        return negative ? -v : v;
    }
}
