package plumb.engine.model;

import static plumb.engine.model.JsonPaths.index;
import static plumb.engine.model.JsonPaths.key;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Reads the grammar of docs/model-format.md from a stream of JSON tokens: the type of every value,
 * required and unknown keys, and the spellings of enumerated strings. Numeric rules, bin counts and
 * cross-references are {@link ModelValidator}'s.
 *
 * <p>Streaming rather than a tree because per-bin arrays go straight into {@code double[]}: a big
 * model then costs 8 bytes per number instead of a node object each, and a value of the wrong kind
 * (say a deep nest of arrays where a number belongs) is refused at its first token, never built.
 * Jackson's exceptions (not JSON, limits, duplicate keys) pass through as {@link IOException} for
 * {@link ModelReader} to word.
 */
final class ModelParser {

    private static final String TOP_KEYS =
            "format, name, description, poi, channels, parameters, groups, labels, options";
    private static final String CHANNEL_KEYS = "name, observable, edges, observed, samples";
    private static final String SAMPLE_KEYS = "name, yields, mcError, factors, binFactors, variations";
    private static final String VARIATION_KEYS =
            "parameter, norm, shape, normInterpolation, shapeInterpolation";
    private static final String PARAMETER_KEYS = "name, value, range, fixed, constraint";
    private static final String OPTION_KEYS = "mcStatThreshold, mcStatConstraint, pruneBelow";

    private final JsonParser p;
    private final String source;

    private ModelParser(JsonParser p, String source) {
        this.p = p;
        this.source = source;
    }

    /** Reads one whole document from {@code p}, which must not have been advanced yet. */
    static Model read(JsonParser p, String source) throws IOException {
        ModelParser parser = new ModelParser(p, source);
        if (p.nextToken() == null) throw new ModelException(source, "", "empty file, expected a JSON object");
        Model model = parser.readModel();
        if (p.nextToken() != null) {
            throw new ModelException(source, "", "line %d, column %d: not JSON: more content after the end of the model",
                    p.currentLocation().getLineNr(), p.currentLocation().getColumnNr());
        }
        return model;
    }

    // ---- objects of the format, one method each, in the order of the format page ----

    private Model readModel() throws IOException {
        expectObject("", "a JSON object at the top level");
        String format = null, name = null, description = null, poi = null;
        List<Channel> channels = null;
        List<ParameterSpec> parameters = null;
        Map<String, List<String>> groups = null;
        Map<String, Object> labels = null;
        ModelOptions options = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            p.nextToken();
            switch (k) {
                case "format" -> format = readString(k);
                case "name" -> name = readString(k);
                case "description" -> description = readString(k);
                case "poi" -> poi = readString(k);
                case "channels" -> channels = readChannels(k);
                case "parameters" -> parameters = readParameters(k);
                case "groups" -> groups = readGroups(k);
                case "labels" -> labels = readLabels(k);
                case "options" -> options = readOptions(k);
                default -> throw unknownKey(k, TOP_KEYS);
            }
        }
        require(format, "", "format");
        require(name, "", "name");
        require(channels, "", "channels");
        return new Model(format, name, description, poi, channels, parameters, groups, labels, options);
    }

    private List<Channel> readChannels(String path) throws IOException {
        expectArray(path, "an array of channels");
        List<Channel> channels = new ArrayList<>();
        for (int i = 0; p.nextToken() != JsonToken.END_ARRAY; i++) channels.add(readChannel(index(path, i)));
        return channels;
    }

    private Channel readChannel(String path) throws IOException {
        expectObject(path, "a channel object");
        String name = null, observable = null;
        double[] edges = null, observed = null;
        List<Sample> samples = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "name" -> name = readString(at);
                case "observable" -> observable = readString(at);
                case "edges" -> edges = readNumbers(at);
                case "observed" -> observed = readNumbers(at);
                case "samples" -> samples = readSamples(at);
                default -> throw unknownKey(at, CHANNEL_KEYS);
            }
        }
        require(name, path, "name");
        require(samples, path, "samples");
        return new Channel(name, observable, edges, observed, samples);
    }

    private List<Sample> readSamples(String path) throws IOException {
        expectArray(path, "an array of samples");
        List<Sample> samples = new ArrayList<>();
        for (int i = 0; p.nextToken() != JsonToken.END_ARRAY; i++) samples.add(readSample(index(path, i)));
        return samples;
    }

    private Sample readSample(String path) throws IOException {
        expectObject(path, "a sample object");
        String name = null;
        double[] yields = null, mcError = null;
        List<String> factors = null;
        List<Variation> variations = null;
        String binFactors = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "name" -> name = readString(at);
                case "yields" -> yields = readNumbers(at);
                case "mcError" -> mcError = readNumbers(at);
                case "factors" -> factors = readStrings(at);
                case "variations" -> variations = readVariations(at);
                case "binFactors" -> binFactors = readString(at);
                default -> throw unknownKey(at, SAMPLE_KEYS);
            }
        }
        require(name, path, "name");
        require(yields, path, "yields");
        return new Sample(name, yields, mcError, factors, variations, binFactors);
    }

    private List<Variation> readVariations(String path) throws IOException {
        expectArray(path, "an array of variations");
        List<Variation> variations = new ArrayList<>();
        for (int i = 0; p.nextToken() != JsonToken.END_ARRAY; i++) variations.add(readVariation(index(path, i)));
        return variations;
    }

    private Variation readVariation(String path) throws IOException {
        expectObject(path, "a variation object");
        String parameter = null;
        Variation.NormEffect norm = null;
        Variation.ShapeEffect shape = null;
        Interpolation normMode = null, shapeMode = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "parameter" -> parameter = readString(at);
                case "norm" -> norm = readNorm(at);
                case "shape" -> shape = readShape(at);
                case "normInterpolation" -> normMode = readInterpolation(at, false);
                case "shapeInterpolation" -> shapeMode = readInterpolation(at, true);
                default -> throw unknownKey(at, VARIATION_KEYS);
            }
        }
        require(parameter, path, "parameter");
        if (norm == null && shape == null) {
            throw new ModelException(source, path, "a variation needs \"norm\" or \"shape\" (or both)");
        }
        return new Variation(parameter, norm, shape, normMode, shapeMode);
    }

    private Variation.NormEffect readNorm(String path) throws IOException {
        expectObject(path, "an object {\"down\": number, \"up\": number}");
        Double down = null, up = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "down" -> down = readNumber(at);
                case "up" -> up = readNumber(at);
                default -> throw unknownKey(at, "down, up");
            }
        }
        require(down, path, "down");
        require(up, path, "up");
        return new Variation.NormEffect(down, up);
    }

    private Variation.ShapeEffect readShape(String path) throws IOException {
        expectObject(path, "an object {\"down\": [numbers], \"up\": [numbers]}");
        double[] down = null, up = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "down" -> down = readNumbers(at);
                case "up" -> up = readNumbers(at);
                default -> throw unknownKey(at, "down, up");
            }
        }
        require(down, path, "down");
        require(up, path, "up");
        return new Variation.ShapeEffect(down, up);
    }

    private Interpolation readInterpolation(String path, boolean shape) throws IOException {
        String text = readString(path);
        Interpolation mode = Interpolation.fromJson(text);
        if (mode == null || (shape && mode == Interpolation.EXPONENTIAL)) {
            throw new ModelException(source, path, "\"%s\", expected %s", text,
                    shape ? "\"smooth\" or \"linear\"" : "\"smooth\", \"exponential\" or \"linear\"");
        }
        return mode;
    }

    private List<ParameterSpec> readParameters(String path) throws IOException {
        expectArray(path, "an array of parameter objects");
        List<ParameterSpec> parameters = new ArrayList<>();
        for (int i = 0; p.nextToken() != JsonToken.END_ARRAY; i++) parameters.add(readParameter(index(path, i)));
        return parameters;
    }

    private ParameterSpec readParameter(String path) throws IOException {
        expectObject(path, "a parameter object");
        String name = null;
        Double value = null;
        double[] range = null;
        Boolean fixed = null;
        ParameterSpec.Constraint constraint = null;
        boolean constraintGiven = false;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "name" -> name = readString(at);
                case "value" -> value = readNumber(at);
                case "range" -> {
                    range = readNumbers(at);
                    if (range.length != 2) {
                        throw new ModelException(source, at, "%d values, expected 2 ([lo, hi])", range.length);
                    }
                }
                case "fixed" -> fixed = readBoolean(at);
                case "constraint" -> {
                    constraint = readConstraint(at);
                    constraintGiven = true;
                }
                default -> throw unknownKey(at, PARAMETER_KEYS);
            }
        }
        require(name, path, "name");
        return new ParameterSpec(name, value, range, fixed, constraint, constraintGiven);
    }

    /** A constraint object, or null for JSON null (a free parameter). */
    private ParameterSpec.Constraint readConstraint(String path) throws IOException {
        if (p.currentToken() == JsonToken.VALUE_NULL) return null;
        expectObject(path, "a constraint object or null");
        String type = null;
        Double center = null, width = null, relative = null;
        String centerAt = null, widthAt = null;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "type" -> type = readString(at);
                case "center" -> { center = readNumber(at); centerAt = at; }
                case "width" -> { width = readNumber(at); widthAt = at; }
                case "relative" -> relative = readNumber(at);
                default -> throw unknownKey(at, "type, center, width (gaussian), relative (poisson)");
            }
        }
        require(type, path, "type");
        switch (type) {
            case "gaussian" -> {
                if (relative != null) throw unknownKey(key(path, "relative"), "type, center, width");
                return new ParameterSpec.Gaussian(center, width);
            }
            case "poisson" -> {
                if (centerAt != null) throw unknownKey(centerAt, "type, relative");
                if (widthAt != null) throw unknownKey(widthAt, "type, relative");
                require(relative, path, "relative");
                return new ParameterSpec.Poisson(relative);
            }
            default -> throw new ModelException(source, key(path, "type"),
                    "\"%s\", expected \"gaussian\" or \"poisson\"", type);
        }
    }

    private Map<String, List<String>> readGroups(String path) throws IOException {
        expectObject(path, "an object of group name to an array of parameter names");
        Map<String, List<String>> groups = new LinkedHashMap<>();
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            p.nextToken();
            groups.put(k, readStrings(key(path, k)));
        }
        return groups;
    }

    private Map<String, Object> readLabels(String path) throws IOException {
        expectObject(path, "an object of labels");
        Map<String, Object> labels = new LinkedHashMap<>();
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            JsonToken t = p.nextToken();
            if (t == JsonToken.VALUE_STRING) labels.put(k, p.getText());
            else if (t == JsonToken.VALUE_NUMBER_INT || t == JsonToken.VALUE_NUMBER_FLOAT) labels.put(k, readNumber(at));
            else throw wrongType(at, "a number or a string");
        }
        return labels;
    }

    private ModelOptions readOptions(String path) throws IOException {
        expectObject(path, "an options object");
        ModelOptions d = ModelOptions.DEFAULTS;
        double threshold = d.mcStatThreshold(), prune = d.pruneBelow();
        ModelOptions.McStatConstraint constraint = d.mcStatConstraint();
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String k = p.currentName();
            String at = key(path, k);
            p.nextToken();
            switch (k) {
                case "mcStatThreshold" -> threshold = readNumber(at);
                case "pruneBelow" -> prune = readNumber(at);
                case "mcStatConstraint" -> {
                    String text = readString(at);
                    constraint = ModelOptions.McStatConstraint.fromJson(text);
                    if (constraint == null) {
                        throw new ModelException(source, at, "\"%s\", expected \"gaussian\" or \"poisson\"", text);
                    }
                }
                default -> throw unknownKey(at, OPTION_KEYS);
            }
        }
        return new ModelOptions(threshold, constraint, prune);
    }

    // ---- values ----

    private String readString(String path) throws IOException {
        if (p.currentToken() != JsonToken.VALUE_STRING) throw wrongType(path, "a string");
        return p.getText();
    }

    private boolean readBoolean(String path) throws IOException {
        JsonToken t = p.currentToken();
        if (t == JsonToken.VALUE_TRUE) return true;
        if (t == JsonToken.VALUE_FALSE) return false;
        throw wrongType(path, "true or false");
    }

    /** A finite number; a literal beyond the range of a double (1e400) is refused here. */
    private double readNumber(String path) throws IOException {
        return readNumber(path, -1);
    }

    /**
     * {@link #readNumber(String)} for element {@code index} of the array at {@code path} (or the
     * value at {@code path} itself when index &lt; 0); the element's path is built only for an error.
     */
    private double readNumber(String path, int index) throws IOException {
        JsonToken t = p.currentToken();
        if (t != JsonToken.VALUE_NUMBER_INT && t != JsonToken.VALUE_NUMBER_FLOAT) {
            throw wrongType(index < 0 ? path : index(path, index), "a number");
        }
        double v = DecimalText.exact(p.getTextCharacters(), p.getTextOffset(), p.getTextLength());
        if (Double.isNaN(v)) v = p.getDoubleValue();
        if (!Double.isFinite(v)) {
            throw new ModelException(source, index < 0 ? path : index(path, index),
                    "%s, expected a finite number (beyond the range of a double)", p.getText());
        }
        return v;
    }

    private double[] readNumbers(String path) throws IOException {
        expectArray(path, "an array of numbers");
        double[] values = new double[16];
        int n = 0;
        while (p.nextToken() != JsonToken.END_ARRAY) {
            if (n == values.length) values = Arrays.copyOf(values, 2 * n);
            values[n] = readNumber(path, n);
            n++;
        }
        return Arrays.copyOf(values, n);
    }

    private List<String> readStrings(String path) throws IOException {
        expectArray(path, "an array of strings");
        List<String> values = new ArrayList<>();
        for (int i = 0; p.nextToken() != JsonToken.END_ARRAY; i++) values.add(readString(index(path, i)));
        return values;
    }

    // ---- checks and errors ----

    private void expectObject(String path, String what) {
        if (p.currentToken() != JsonToken.START_OBJECT) throw wrongType(path, what);
    }

    private void expectArray(String path, String what) {
        if (p.currentToken() != JsonToken.START_ARRAY) throw wrongType(path, what);
    }

    private void require(Object value, String path, String k) {
        if (value == null) throw new ModelException(source, key(path, k), "required key is missing");
    }

    private ModelException unknownKey(String path, String known) {
        return new ModelException(source, path, "unknown key (known keys here: %s)", known);
    }

    private ModelException wrongType(String path, String expected) {
        return new ModelException(source, path, "expected %s, found %s", expected, describe(p.currentToken()));
    }

    private static String describe(JsonToken t) {
        if (t == null) return "the end of the input";
        return switch (t) {
            case START_OBJECT -> "an object";
            case START_ARRAY -> "an array";
            case VALUE_STRING -> "a string";
            case VALUE_NUMBER_INT, VALUE_NUMBER_FLOAT -> "a number";
            case VALUE_TRUE, VALUE_FALSE -> "a boolean";
            case VALUE_NULL -> "null";
            default -> t.asString() == null ? t.name() : t.asString();
        };
    }
}
