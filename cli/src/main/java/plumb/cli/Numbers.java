package plumb.cli;

import java.util.Locale;

/** Number formatting for terminal tables. */
public final class Numbers {

    private Numbers() {
    }

    /** "1 warning", "2 warnings": the count and a noun whose plural takes an "s" (every noun we count does). */
    public static String count(long n, String noun) {
        return n + " " + (n == 1 ? noun : noun + "s");
    }

    /** Six significant digits, or "-" for a number that could not be computed. */
    public static String plain(double v) {
        if (!Double.isFinite(v)) return "-";
        return String.format(Locale.ROOT, "%.6g", v).replaceAll("(\\.\\d*?)0+(e|$)", "$1$2").replace(".e", "e").replaceAll("\\.$", "");
    }

    /** Fixed decimals, or "-". */
    public static String fixed(double v, int decimals) {
        if (!Double.isFinite(v)) return "-";
        return String.format(Locale.ROOT, "%." + decimals + "f", v);
    }
}
