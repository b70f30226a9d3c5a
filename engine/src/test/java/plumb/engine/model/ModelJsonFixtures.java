package plumb.engine.model;

import com.fasterxml.jackson.core.JsonPointer;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;

/**
 * A valid model that uses every key of docs/model-format.md, and edits of it for the bad-model
 * tests. Scenario: a fictional detector, a narrow two-photon resonance, invented yields.
 *
 * <p>MC statistics (options.mcStatThreshold = 0.01; both "sr" samples give mcError):
 * δ_0 = sqrt(0.5² + 2²)/105 = 0.01963, δ_1 = sqrt(1² + 1²)/100 = 0.01414,
 * δ_2 = sqrt(0.4² + 0.1²)/64 = 0.00644, so γ exists for sr bins 0 and 1 only; "cr" gives no mcError.
 */
final class ModelJsonFixtures {

    static final String BASE = """
            {
              "format": "plumb-model/1",
              "name": "diphoton-1500",
              "description": "narrow resonance over a falling two-photon background",
              "poi": "mu",
              "channels": [
                {
                  "name": "sr",
                  "observable": "m(γγ) [GeV]",
                  "edges": [1400, 1450, 1500, 1550],
                  "observed": [104, 131, 66],
                  "samples": [
                    {
                      "name": "signal",
                      "yields": [5, 20, 4],
                      "mcError": [0.5, 1, 0.4],
                      "factors": ["mu"],
                      "variations": [
                        {"parameter": "lumi", "norm": {"down": 0.98, "up": 1.02}}
                      ]
                    },
                    {
                      "name": "background",
                      "yields": [100, 80, 60],
                      "mcError": [2, 1, 0.1],
                      "factors": ["bkgNorm"],
                      "variations": [
                        {"parameter": "lumi", "norm": {"down": 0.98, "up": 1.02}, "normInterpolation": "exponential"},
                        {"parameter": "photonScale", "shape": {"down": [102, 79, 58], "up": [98, 81, 62]},
                         "shapeInterpolation": "linear"}
                      ]
                    }
                  ]
                },
                {
                  "name": "cr",
                  "observed": [1010, 890],
                  "samples": [
                    {"name": "background", "yields": [1000, 900], "factors": ["bkgNorm"]}
                  ]
                }
              ],
              "parameters": [
                {"name": "mu", "value": 1, "range": [-2, 20]},
                {"name": "bkgNorm", "constraint": {"type": "poisson", "relative": 0.1}},
                {"name": "lumi", "constraint": {"type": "gaussian", "center": 0, "width": 1}},
                {"name": "mcstat:sr:0", "fixed": true},
                {"name": "photonScale", "constraint": null}
              ],
              "groups": {"theory": ["photonScale"], "luminosity": ["lumi"], "mcStatistics": ["mcstat:sr:0", "mcstat:sr:1"]},
              "labels": {"mass": 1500, "detector": "fictional"},
              "options": {"mcStatThreshold": 0.01, "mcStatConstraint": "poisson", "pruneBelow": 0.001}
            }
            """;

    /** Marks an edit that removes the value at its pointer. */
    static final String REMOVE = "<remove>";

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private ModelJsonFixtures() {
    }

    /**
     * {@link #BASE} with edits applied: pairs of a JSON pointer (RFC 6901) and the new JSON value
     * or {@link #REMOVE}. A pointer one past the end of an array appends.
     */
    static String edited(String... pointerValuePairs) {
        try {
            JsonNode root = MAPPER.readTree(BASE);
            for (int i = 0; i < pointerValuePairs.length; i += 2) {
                JsonPointer ptr = JsonPointer.compile(pointerValuePairs[i]);
                String json = pointerValuePairs[i + 1];
                JsonNode parent = root.at(ptr.head());
                JsonPointer last = ptr.last();
                if (parent instanceof ObjectNode o) {
                    String k = last.getMatchingProperty();
                    if (json.equals(REMOVE)) o.remove(k);
                    else o.set(k, MAPPER.readTree(json));
                } else if (parent instanceof ArrayNode a) {
                    int k = last.getMatchingIndex();
                    if (json.equals(REMOVE)) a.remove(k);
                    else if (k == a.size()) a.add(MAPPER.readTree(json));
                    else a.set(k, MAPPER.readTree(json));
                } else {
                    throw new IllegalArgumentException("no container at " + ptr.head());
                }
            }
            return MAPPER.writerWithDefaultPrettyPrinter().writeValueAsString(root);
        } catch (java.io.IOException e) {
            throw new IllegalArgumentException(e);
        }
    }
}
