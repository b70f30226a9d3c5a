package plumb.models;

import com.fasterxml.jackson.databind.JsonNode;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Checks that a JSON tree, parsed by Jackson from a written model file, holds exactly the content
 * of the model records: every value equal (doubles bit for bit), no key more, no key less.
 */
final class ModelJsonAssert {

    private ModelJsonAssert() {
    }

    static void assertSameContent(Model m, JsonNode root) {
        int keys = 0;
        keys += text(m.format(), root, "format");
        keys += text(m.name(), root, "name");
        keys += text(m.description(), root, "description");
        keys += text(m.poi(), root, "poi");
        JsonNode channels = root.get("channels");
        assertEquals(m.channels().size(), channels.size(), "channels");
        for (int c = 0; c < m.channels().size(); c++) channel(m.channels().get(c), channels.get(c), "channels[" + c + "]");
        keys++;
        if (!m.parameters().isEmpty()) {
            JsonNode params = root.get("parameters");
            assertEquals(m.parameters().size(), params.size());
            for (int p = 0; p < params.size(); p++) parameter(m.parameters().get(p), params.get(p));
            keys++;
        }
        if (!m.groups().isEmpty()) {
            JsonNode groups = root.get("groups");
            assertEquals(m.groups().size(), groups.size());
            for (Map.Entry<String, List<String>> e : m.groups().entrySet()) names(e.getValue(), groups.get(e.getKey()));
            keys++;
        }
        if (!m.labels().isEmpty()) {
            JsonNode labels = root.get("labels");
            assertEquals(m.labels().size(), labels.size());
            for (Map.Entry<String, Object> e : m.labels().entrySet()) {
                JsonNode v = labels.get(e.getKey());
                if (e.getValue() instanceof Number n) number(n.doubleValue(), v, "labels." + e.getKey());
                else assertEquals(e.getValue(), v.asText());
            }
            keys++;
        }
        if (root.has("options")) keys++; // only written when not the defaults; the writer's own test covers it
        assertEquals(keys, root.size(), "top-level keys");
    }

    private static void channel(Channel ch, JsonNode node, String path) {
        int keys = 1 + text(ch.observable(), node, "observable");
        assertEquals(ch.name(), node.get("name").asText());
        keys += numbers(ch.edges(), node.get("edges"), path + ".edges");
        keys += numbers(ch.observed(), node.get("observed"), path + ".observed");
        JsonNode samples = node.get("samples");
        assertEquals(ch.samples().size(), samples.size(), path);
        for (int s = 0; s < samples.size(); s++) sample(ch.samples().get(s), samples.get(s), path + ".samples[" + s + "]");
        keys++;
        assertEquals(keys, node.size(), path);
    }

    private static void sample(Sample s, JsonNode node, String path) {
        assertEquals(s.name(), node.get("name").asText());
        int keys = 1 + numbers(s.yields(), node.get("yields"), path + ".yields");
        keys += numbers(s.mcError(), node.get("mcError"), path + ".mcError");
        if (!s.factors().isEmpty()) {
            names(s.factors(), node.get("factors"));
            keys++;
        }
        if (!s.variations().isEmpty()) {
            JsonNode vars = node.get("variations");
            assertEquals(s.variations().size(), vars.size(), path);
            for (int v = 0; v < vars.size(); v++) variation(s.variations().get(v), vars.get(v), path + ".variations[" + v + "]");
            keys++;
        }
        assertEquals(keys, node.size(), path);
    }

    private static void variation(Variation v, JsonNode node, String path) {
        assertEquals(v.parameter(), node.get("parameter").asText(), path);
        int keys = 1;
        if (v.norm() != null) {
            number(v.norm().down(), node.get("norm").get("down"), path + ".norm.down");
            number(v.norm().up(), node.get("norm").get("up"), path + ".norm.up");
            assertEquals(2, node.get("norm").size());
            keys++;
        } else {
            assertFalse(node.has("norm"), path);
        }
        if (v.shape() != null) {
            numbers(v.shape().down(), node.get("shape").get("down"), path + ".shape.down");
            numbers(v.shape().up(), node.get("shape").get("up"), path + ".shape.up");
            assertEquals(2, node.get("shape").size());
            keys++;
        } else {
            assertFalse(node.has("shape"), path);
        }
        if (v.normInterpolation() != null) {
            assertEquals(v.normInterpolation().jsonName(), node.get("normInterpolation").asText());
            keys++;
        }
        if (v.shapeInterpolation() != null) {
            assertEquals(v.shapeInterpolation().jsonName(), node.get("shapeInterpolation").asText());
            keys++;
        }
        assertEquals(keys, node.size(), path);
    }

    private static void parameter(ParameterSpec p, JsonNode node) {
        assertEquals(p.name(), node.get("name").asText());
        int keys = 1;
        if (p.value() != null) {
            number(p.value(), node.get("value"), p.name() + ".value");
            keys++;
        }
        keys += numbers(p.range(), node.get("range"), p.name() + ".range");
        if (p.fixed() != null) {
            assertEquals(p.fixed(), node.get("fixed").asBoolean());
            keys++;
        }
        if (p.constraint() instanceof ParameterSpec.Poisson poisson) {
            assertEquals("poisson", node.get("constraint").get("type").asText());
            number(poisson.relative(), node.get("constraint").get("relative"), p.name() + ".relative");
            keys++;
        } else if (p.constraint() instanceof ParameterSpec.Gaussian gauss) {
            assertEquals("gaussian", node.get("constraint").get("type").asText());
            if (gauss.center() != null) number(gauss.center(), node.get("constraint").get("center"), p.name());
            if (gauss.width() != null) number(gauss.width(), node.get("constraint").get("width"), p.name());
            keys++;
        } else if (p.constraintGiven()) {
            assertTrue(node.get("constraint").isNull());
            keys++;
        }
        assertEquals(keys, node.size(), p.name());
    }

    private static int text(String expected, JsonNode parent, String key) {
        if (expected == null) {
            assertFalse(parent.has(key), key);
            return 0;
        }
        assertEquals(expected, parent.get(key).asText(), key);
        return 1;
    }

    private static void names(List<String> expected, JsonNode array) {
        assertEquals(expected.size(), array.size());
        for (int i = 0; i < array.size(); i++) assertEquals(expected.get(i), array.get(i).asText());
    }

    private static int numbers(double[] expected, JsonNode array, String path) {
        if (expected == null) {
            assertTrue(array == null, path + " should be absent");
            return 0;
        }
        assertEquals(expected.length, array.size(), path);
        for (int i = 0; i < expected.length; i++) number(expected[i], array.get(i), path + "[" + i + "]");
        return 1;
    }

    /** Bit-for-bit equality, parsing the number's text with the JDK. */
    private static void number(double expected, JsonNode node, String path) {
        assertTrue(node.isNumber(), path);
        assertEquals(Double.doubleToLongBits(expected), Double.doubleToLongBits(Double.parseDouble(node.asText())), path);
    }
}
