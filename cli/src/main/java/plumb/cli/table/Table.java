package plumb.cli.table;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

/**
 * A plain table: an optional title, a header and rows of text cells, every row as wide as the
 * header. Cells are already formatted text; {@link #measurement(double, double)} and
 * {@link #number(double, int)} format numbers consistently. Render with {@link TableFormat}.
 *
 * @param title  caption shown above the table, or null
 * @param header column titles, at least one
 * @param rows   body rows, each with {@code header.size()} cells (null cells become "")
 */
public record Table(String title, List<String> header, List<List<String>> rows) {

    /** Shown for a number that could not be computed (null or NaN). */
    public static final String MISSING = "–";

    public Table {
        if (header == null || header.isEmpty()) throw new IllegalArgumentException("a table needs at least one column");
        header = List.copyOf(header);
        List<List<String>> copy = new ArrayList<>(rows.size());
        for (int r = 0; r < rows.size(); r++) {
            List<String> row = rows.get(r);
            if (row.size() != header.size()) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "row %d has %d cells, the header has %d", r, row.size(), header.size()));
            }
            List<String> cells = new ArrayList<>(row.size());
            for (String cell : row) cells.add(cell == null ? "" : cell);
            copy.add(List.copyOf(cells));
        }
        rows = List.copyOf(copy);
    }

    /** Starts a table with the given title (may be null) and column titles. */
    public static Builder builder(String title, String... header) {
        return new Builder(title, Arrays.asList(header));
    }

    /** Number of columns. */
    public int columns() {
        return header.size();
    }

    /**
     * True when every non-empty body cell of column {@code c} reads as a number (optionally with
     * an uncertainty), so renderers may right-align it.
     */
    public boolean numericColumn(int c) {
        boolean any = false;
        for (List<String> row : rows) {
            String cell = row.get(c);
            if (cell.isEmpty() || cell.equals(MISSING)) continue;
            if (!looksNumeric(cell)) return false;
            any = true;
        }
        return any;
    }

    private static boolean looksNumeric(String cell) {
        char first = cell.charAt(0);
        int start = (first == '-' || first == '+' || first == '−') && cell.length() > 1 ? 1 : 0;
        char c = cell.charAt(start);
        return Character.isDigit(c) || (c == '.' && cell.length() > start + 1 && Character.isDigit(cell.charAt(start + 1)));
    }

    /**
     * Formats a value with its uncertainty: the uncertainty rounded to two significant digits,
     * the value rounded to the same decimal place, joined by " ± ". Two digits keep the
     * uncertainty meaningful (one digit can misstate it by up to 50% near 0.1x), and more value
     * digits than the uncertainty supports would only be noise (common practice). Examples:
     * 12.345 ± 0.0678 gives "12.345 ± 0.068"; 1234.5 ± 56.7 gives "1235 ± 57"; 0.0996 ± 0.0996
     * gives "0.10 ± 0.10" (the decimal place follows the uncertainty after rounding);
     * 123456 ± 5678 gives "123500 ± 5700". Halves round away from zero. Without a usable
     * uncertainty the value gets {@link #number(double, int) four significant digits}: an
     * uncertainty of exactly zero prints as "0" ("5.000 ± 0"), a negative or non-finite one as
     * {@value #MISSING}.
     *
     * @param value the central value; NaN or infinite gives {@value #MISSING}
     * @param error the uncertainty, ≥ 0
     * @return the formatted text
     */
    public static String measurement(double value, double error) {
        if (!Double.isFinite(value)) return MISSING;
        if (!(error > 0) || !Double.isFinite(error)) {
            return number(value, 4) + " ± " + (error == 0 ? "0" : MISSING);
        }
        BigDecimal err = new BigDecimal(error).round(new MathContext(2, RoundingMode.HALF_UP));
        // BigDecimal drops trailing zeros of exact inputs: 1.0 arrives as "1" (one digit); keep two.
        int scale = err.scale() + Math.max(0, 2 - err.precision());
        BigDecimal val = new BigDecimal(value).setScale(scale, RoundingMode.HALF_UP);
        return plain(val) + " ± " + plain(err.setScale(scale, RoundingMode.HALF_UP));
    }

    /**
     * Formats a number to {@code digits} significant digits in plain notation (no exponent)
     * when its magnitude lies in [1e-4, 1e7), else in scientific notation such as "1.23e-06".
     * NaN and infinities give {@value #MISSING}.
     */
    public static String number(double value, int digits) {
        if (!Double.isFinite(value)) return MISSING;
        if (value == 0) return digits > 1 ? "0." + "0".repeat(digits - 1) : "0";
        double magnitude = Math.abs(value);
        if (magnitude < 1e-4 || magnitude >= 1e7) {
            return String.format(Locale.ROOT, "%." + (digits - 1) + "e", value);
        }
        BigDecimal rounded = new BigDecimal(value).round(new MathContext(digits, RoundingMode.HALF_UP));
        if (rounded.precision() < digits) {   // keep trailing zeros: 5 -> "5.000" at four digits
            rounded = rounded.setScale(rounded.scale() + digits - rounded.precision(), RoundingMode.UNNECESSARY);
        }
        return plain(rounded);
    }

    /** {@link #number(double, int)} for a possibly missing value. */
    public static String number(Double value, int digits) {
        return value == null ? MISSING : number(value.doubleValue(), digits);
    }

    private static String plain(BigDecimal d) {
        return d.signum() == 0 ? d.abs().toPlainString() : d.toPlainString();
    }

    /** Collects rows, then builds the immutable {@link Table}. */
    public static final class Builder {
        private final String title;
        private final List<String> header;
        private final List<List<String>> rows = new ArrayList<>();

        private Builder(String title, List<String> header) {
            this.title = title;
            this.header = header;
        }

        /** Appends one row; it must have as many cells as the header. */
        public Builder row(String... cells) {
            rows.add(Arrays.asList(cells));
            return this;
        }

        /** Appends one row; it must have as many cells as the header. */
        public Builder row(List<String> cells) {
            rows.add(new ArrayList<>(cells));
            return this;
        }

        public Table build() {
            return new Table(title, header, rows);
        }
    }
}
