package plumb.engine.tooling;

/**
 * How a one-sided variation is made two-sided (both are common practice). A variation is one-sided
 * where up and down move the same way from nominal, or where one of them does not move at all.
 */
public enum Symmetrisation {
    /** Keep the side that moves further and mirror it about nominal onto the other side. */
    LARGER("larger"),
    /** Move both sides by the mean of |up − nominal| and |down − nominal|, the larger side keeping its sign. */
    MEAN("mean");

    private final String optionName;

    Symmetrisation(String optionName) {
        this.optionName = optionName;
    }

    /** The spelling on the command line and in change logs. */
    public String optionName() {
        return optionName;
    }

    /** The constant spelled {@code name}, or null. */
    public static Symmetrisation fromName(String name) {
        for (Symmetrisation s : values()) if (s.optionName.equals(name)) return s;
        return null;
    }
}
