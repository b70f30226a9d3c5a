package plumb.engine.tooling;

/**
 * One value of a histogram table (docs/import-format.md): a bin of a nominal, varied or data
 * histogram, or a κ of a norm-only variation. Absent numbers are NaN, an absent bin is −1.
 *
 * @param variation the variation's parameter, or null for a nominal or data row
 * @param where     where the row came from, for error messages
 */
public record HistogramRow(String region, String sample, String variation, Side side, int bin, double low,
                           double high, double content, double error, Where where) {

    /** The sample name reserved for observed counts. */
    public static final String DATA = "@data";

    /** What a row holds. */
    public enum Side {
        NOMINAL("nominal"), UP("up"), DOWN("down"), KAPPA_UP("kappa_up"), KAPPA_DOWN("kappa_down");

        private final String text;

        Side(String text) {
            this.text = text;
        }

        public String text() {
            return text;
        }

        public boolean kappa() {
            return this == KAPPA_UP || this == KAPPA_DOWN;
        }

        /** The partner side (up for down, κ-up for κ-down), or null for nominal. */
        public Side partner() {
            return switch (this) {
                case UP -> DOWN;
                case DOWN -> UP;
                case KAPPA_UP -> KAPPA_DOWN;
                case KAPPA_DOWN -> KAPPA_UP;
                case NOMINAL -> null;
            };
        }

        public static Side of(String text) {
            for (Side s : values()) if (s.text.equals(text)) return s;
            return null;
        }
    }

    /** Locates a row's cells: a line and column of a CSV file, a JSON path of a JSON file. */
    public interface Where {
        /** The place of the cell {@code column} (a CSV column name), for a message. */
        String at(String column);
    }
}
