package plumb.engine.tooling;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.Iterator;

/**
 * The settings file of an import (docs/import-format.md): a model file without its numbers per
 * bin. Written from a model, it holds everything a histogram table cannot (POI, factors,
 * parameters, groups, labels, options, observables, interpolations), so that table plus settings
 * give the model back.
 */
public final class ModelSettings {

    private static final ObjectMapper JSON = new ObjectMapper();

    private ModelSettings() {
    }

    /** The settings of a model as JSON text. */
    public static String of(Model m) {
        ObjectNode root;
        try {
            root = (ObjectNode) JSON.readTree(ModelWriter.toJson(m));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        root.remove("format");
        ArrayNode channels = (ArrayNode) root.get("channels");
        for (Iterator<JsonNode> ci = channels.elements(); ci.hasNext(); ) {
            ObjectNode ch = (ObjectNode) ci.next();
            ch.remove("edges");
            ch.remove("observed");
            ArrayNode samples = (ArrayNode) ch.get("samples");
            for (Iterator<JsonNode> si = samples.elements(); si.hasNext(); ) {
                ObjectNode s = (ObjectNode) si.next();
                s.remove("yields");
                s.remove("mcError");
                ArrayNode vars = (ArrayNode) s.get("variations");
                if (vars != null) {
                    for (Iterator<JsonNode> vi = vars.elements(); vi.hasNext(); ) {
                        ObjectNode v = (ObjectNode) vi.next();
                        v.remove("norm");
                        v.remove("shape");
                        if (v.size() == 1) vi.remove();
                    }
                    if (vars.isEmpty()) s.remove("variations");
                }
                if (s.size() == 1) si.remove();
            }
            if (samples.isEmpty()) ch.remove("samples");
            if (ch.size() == 1) ci.remove();
        }
        if (channels.isEmpty()) root.remove("channels");
        return root.toPrettyString() + "\n";
    }
}
