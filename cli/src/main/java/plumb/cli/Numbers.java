package plumb.cli;

import java.util.Locale;

/** Number formatting for terminal tables. */
public final class Numbers {

    private Numbers() {
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
