package plumb.engine.model;

/** The model's {@code options}, with the format's defaults. */
public record ModelOptions(double mcStatThreshold, McStatConstraint mcStatConstraint, double pruneBelow) {

    public static final ModelOptions DEFAULTS = new ModelOptions(0.0, McStatConstraint.GAUSSIAN, 0.0);

    /** The constraint form of the per-bin MC-statistics parameters. */
    public enum McStatConstraint {
        GAUSSIAN("gaussian"), POISSON("poisson");

        private final String jsonName;

        McStatConstraint(String jsonName) {
            this.jsonName = jsonName;
        }

        public String jsonName() {
            return jsonName;
        }

        public static McStatConstraint fromJson(String name) {
            for (McStatConstraint c : values()) if (c.jsonName.equals(name)) return c;
            return null;
        }
    }
}
