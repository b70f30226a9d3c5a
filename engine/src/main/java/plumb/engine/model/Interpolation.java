package plumb.engine.model;

/** Interpolation between the nominal and the ±1 variations (docs/model-format.md). */
public enum Interpolation {
    SMOOTH("smooth"), EXPONENTIAL("exponential"), LINEAR("linear");

    private final String jsonName;

    Interpolation(String jsonName) {
        this.jsonName = jsonName;
    }

    /** The spelling used in model files. */
    public String jsonName() {
        return jsonName;
    }

    /** The constant spelled {@code name} in a model file, or null. */
    public static Interpolation fromJson(String name) {
        for (Interpolation i : values()) if (i.jsonName.equals(name)) return i;
        return null;
    }
}
