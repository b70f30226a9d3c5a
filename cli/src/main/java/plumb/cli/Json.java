package plumb.cli;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;

import java.util.Map;

/** Result files: Jackson trees, numbers that could not be computed written as null (never NaN). */
public final class Json {

    private static final ObjectMapper MAPPER = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private Json() {
    }

    public static ObjectNode object() {
        return MAPPER.createObjectNode();
    }

    /** A result's top level: the model's labels and the data set used (docs/cli-contract.md). */
    public static ObjectNode result(Map<String, Object> labels, String data) {
        ObjectNode root = object();
        ObjectNode l = root.putObject("labels");
        labels.forEach((k, v) -> {
            if (v instanceof Number n) l.put(k, n.doubleValue());
            else l.put(k, String.valueOf(v));
        });
        root.put("data", data);
        return root;
    }

    /** Puts a number, or null when it is not finite. */
    public static void put(ObjectNode node, String key, double value) {
        if (Double.isFinite(value)) node.put(key, value);
        else node.putNull(key);
    }

    /** Appends a number, or null when it is not finite. */
    public static void add(ArrayNode array, double value) {
        if (Double.isFinite(value)) array.add(value);
        else array.addNull();
    }

    public static ArrayNode array(ObjectNode node, String key, double[] values) {
        ArrayNode a = node.putArray(key);
        for (double v : values) add(a, v);
        return a;
    }

    public static String write(Object node) {
        try {
            return MAPPER.writeValueAsString(node) + "\n";
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    /**
     * The rule for result files on exit status 1 (docs/cli-contract.md): the result, or an empty
     * object when there is none, with {@code "converged": false} and the one-line {@code "failure"}.
     */
    public static ObjectNode failed(ObjectNode root, String why) {
        root.put("converged", false);
        root.put("failure", why);
        return root;
    }

    public static ObjectMapper mapper() {
        return MAPPER;
    }
}
