package plumb.engine.model;

import java.util.List;
import java.util.Map;

/**
 * A validated model, exactly as read from a model file (docs/model-format.md). Optional keys that
 * were absent are null (or empty collections); defaults are applied by the compiler, not here, so
 * that a model can be written back unchanged.
 *
 * @param format      always {@link #FORMAT}
 * @param poi         name of the parameter of interest, or null
 * @param parameters  the {@code parameters} entries, in file order (empty when absent)
 * @param groups      group name to member names, in file order (empty when absent)
 * @param labels      free labels, values are {@link Double} or {@link String} (empty when absent)
 * @param options     never null; defaults when absent
 */
public record Model(String format, String name, String description, String poi,
                    List<Channel> channels, List<ParameterSpec> parameters,
                    Map<String, List<String>> groups, Map<String, Object> labels,
                    ModelOptions options) {

    public static final String FORMAT = "plumb-model/1";

    public Model {
        channels = List.copyOf(channels);
        parameters = parameters == null ? List.of() : List.copyOf(parameters);
        groups = groups == null ? Map.of() : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(groups));
        labels = labels == null ? Map.of() : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(labels));
        options = options == null ? ModelOptions.DEFAULTS : options;
    }

    /** Copy with the observed counts of every channel replaced ({@code observed.get(c)} may be null: blinded). */
    public Model withObserved(List<double[]> observed) {
        List<Channel> out = new java.util.ArrayList<>(channels.size());
        for (int c = 0; c < channels.size(); c++) out.add(channels.get(c).withObserved(observed.get(c)));
        return new Model(format, name, description, poi, out, parameters, groups, labels, options);
    }
}
