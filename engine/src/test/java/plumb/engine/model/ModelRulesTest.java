package plumb.engine.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.engine.model.ModelJsonFixtures.REMOVE;
import static plumb.engine.model.ModelJsonFixtures.edited;

import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * One bad model per rule of docs/model-format.md (the source of every case below): each case edits
 * the valid {@link ModelJsonFixtures#BASE} so that exactly one rule breaks, and checks the JSON path the
 * error names (as the page's "Errors" section prescribes) and the wording of the rule.
 */
class ModelRulesTest {

    private static final String SRC = "bad.json";
    private static final String SIG = "/channels/0/samples/0";     // sr, signal
    private static final String BKG = "/channels/0/samples/1";     // sr, background
    private static final String LUMI = SIG + "/variations/0";
    private static final String SCALE = BKG + "/variations/1";     // the shape variation

    static Stream<Arguments> badModels() {
        return Stream.of(
                // ---- top level: required keys, exact format string, names, unknown keys, types
                bad("format", "\"plumb-model/2\", expected \"plumb-model/1\"", "/format", "\"plumb-model/2\""),
                bad("format", "required key is missing", "/format", REMOVE),
                bad("format", "expected a string, found a number", "/format", "1"),
                bad("name", "required key is missing", "/name", REMOVE),
                bad("name", "\"two words\", a name must match [A-Za-z0-9_.:+-]{1,128}", "/name", "\"two words\""),
                bad("name", "a name must match", "/name", "\"" + "n".repeat(129) + "\""),
                bad("name", "\"\", a name must match", "/name", "\"\""),
                bad("name", "\"café\", a name must match", "/name", "\"café\""),
                bad("description", "expected a string, found an array", "/description", "[]"),
                bad("colour", "unknown key", "/colour", "\"red\""),
                bad("channels", "required key is missing", "/channels", REMOVE),
                bad("channels", "empty, expected at least one channel", "/channels", "[]"),
                bad("channels", "expected an array of channels, found an object", "/channels", "{}"),
                bad("channels[1]", "expected a channel object, found a string", "/channels/1", "\"cr\""),
                // ---- channel
                bad("channels[0].colour", "unknown key", "/channels/0/colour", "\"blue\""),
                bad("channels[0].name", "required key is missing", "/channels/0/name", REMOVE),
                bad("channels[0].name", "\"s r\", a name must match", "/channels/0/name", "\"s r\""),
                bad("channels[1].name", "\"sr\" repeats channels[0].name", "/channels/1/name", "\"sr\""),
                bad("channels[0].observable", "expected a string, found a number", "/channels/0/observable", "3"),
                bad("channels[0].samples", "required key is missing", "/channels/0/samples", REMOVE),
                bad("channels[0].samples", "empty, expected at least one sample", "/channels/0/samples", "[]"),
                // edges: strictly increasing, numbers, at least two
                bad("channels[0].edges[2]", "1450.0, must be > 1450.0 (edges[1]): edges strictly increase",
                        "/channels/0/edges/2", "1450"),
                bad("channels[0].edges[1]", "1300.0, must be > 1400.0", "/channels/0/edges/1", "1300"),
                bad("channels[0].edges[1]", "expected a number, found a string", "/channels/0/edges/1", "\"1450\""),
                bad("channels[0].edges", "expected an array of numbers, found a number", "/channels/0/edges", "1400"),
                bad("channels[0].edges", "1 values, expected at least 2", "/channels/0/edges", "[1400]"),
                // bin count: edges, then observed, then the samples' yields fix it; the others agree
                bad("channels[0].observed", "4 values, expected 3 (the bin count set by channels[0].edges)",
                        "/channels/0/observed", "[1, 2, 3, 4]"),
                bad("channels[0].observed[1]", "-1.0, must be >= 0", "/channels/0/observed/1", "-1"),
                bad("channels[0].observed", "expected an array of numbers, found null", "/channels/0/observed", "null"),
                bad("channels[1].samples[0].yields", "3 values, expected 2 (the bin count set by channels[1].observed)",
                        "/channels/1/samples/0/yields", "[1, 2, 3]"),
                bad("channels[1].samples[1].yields",
                        "3 values, expected 2 (the bin count set by channels[1].samples[0].yields)",
                        "/channels/1/observed", REMOVE,
                        "/channels/1/samples/1", "{\"name\": \"other\", \"yields\": [1, 2, 3]}"),
                bad("channels[1].samples[0].yields", "0 values, expected at least 1",
                        "/channels/1/observed", REMOVE, "/channels/1/samples/0/yields", "[]"),
                bad("channels[1].observed", "0 values, expected at least 1", "/channels/1/observed", "[]"),
                // ---- sample
                bad("channels[0].samples[1].name", "\"signal\" repeats channels[0].samples[0].name",
                        BKG + "/name", "\"signal\""),
                bad("channels[0].samples[0].name", "required key is missing", SIG + "/name", REMOVE),
                bad("channels[0].samples[0].yields[2]", "-3.0, must be >= 0", SIG + "/yields/2", "-3"),
                bad("channels[0].samples[0].yields", "required key is missing", SIG + "/yields", REMOVE),
                bad("channels[0].samples[0].mcError[0]", "-0.5, must be >= 0", SIG + "/mcError/0", "-0.5"),
                bad("channels[0].samples[0].mcError", "2 values, expected 3", SIG + "/mcError", "[1, 1]"),
                bad("channels[0].samples[0].weight", "unknown key", SIG + "/weight", "2"),
                bad("channels[0].samples[0].factors", "expected an array of strings, found a string",
                        SIG + "/factors", "\"mu\""),
                bad("channels[0].samples[0].factors[0]", "expected a string, found a number", SIG + "/factors/0", "1"),
                bad("channels[0].samples[0].factors[0]", "\"m u\", a name must match", SIG + "/factors/0", "\"m u\""),
                bad("channels[0].samples[0].factors[0]", "reserved for the generated MC-statistics parameters",
                        SIG + "/factors/0", "\"mcstat:sr:0\""),
                // ---- variation
                bad("channels[0].samples[0].variations", "expected an array of variations, found an object",
                        SIG + "/variations", "{}"),
                bad("channels[0].samples[0].variations[0]", "a variation needs \"norm\" or \"shape\"",
                        LUMI + "/norm", REMOVE),
                bad("channels[0].samples[0].variations[0].parameter", "required key is missing",
                        LUMI + "/parameter", REMOVE),
                bad("channels[0].samples[0].variations[0].parameter", "reserved for the generated",
                        LUMI + "/parameter", "\"mcstat:sr:1\""),
                bad("channels[0].samples[0].variations[0].strength", "unknown key", LUMI + "/strength", "1"),
                bad("channels[0].samples[0].variations[0].norm.up", "0.0, must be > 0", LUMI + "/norm/up", "0"),
                bad("channels[0].samples[0].variations[0].norm.down", "-0.5, must be > 0", LUMI + "/norm/down", "-0.5"),
                bad("channels[0].samples[0].variations[0].norm.down", "required key is missing",
                        LUMI + "/norm/down", REMOVE),
                bad("channels[0].samples[0].variations[0].norm.side", "unknown key", LUMI + "/norm/side", "1"),
                bad("channels[0].samples[0].variations[0].norm", "expected an object", LUMI + "/norm", "1.02"),
                bad("channels[0].samples[1].variations[1].shape.up", "2 values, expected 3",
                        SCALE + "/shape/up", "[98, 81]"),
                bad("channels[0].samples[1].variations[1].shape.down[1]", "-79.0, must be >= 0",
                        SCALE + "/shape/down/1", "-79"),
                bad("channels[0].samples[1].variations[1].shape.down", "required key is missing",
                        SCALE + "/shape/down", REMOVE),
                bad("channels[0].samples[1].variations[0].normInterpolation",
                        "\"cubic\", expected \"smooth\", \"exponential\" or \"linear\"",
                        BKG + "/variations/0/normInterpolation", "\"cubic\""),
                bad("channels[0].samples[1].variations[1].shapeInterpolation",
                        "\"exponential\", expected \"smooth\" or \"linear\"",
                        SCALE + "/shapeInterpolation", "\"exponential\""),
                // ---- parameters
                bad("parameters[5].name", "\"ghost\" is used nowhere", "/parameters/5", "{\"name\": \"ghost\"}"),
                bad("parameters[5].name", "\"lumi\" repeats parameters[2].name", "/parameters/5", "{\"name\": \"lumi\"}"),
                bad("parameters[0].name", "required key is missing", "/parameters/0/name", REMOVE),
                bad("parameters[0].initial", "unknown key", "/parameters/0/initial", "1"),
                bad("parameters[0].value", "25.0, outside the range [-2.0, 20.0]", "/parameters/0/value", "25"),
                // no range given: the default of the kind, [-6, 6] for a variation parameter
                bad("parameters[2].value", "6.5, outside the range [-6.0, 6.0]", "/parameters/2/value", "6.5"),
                // no range given: [0, 50] for a parameter used only in factors
                bad("parameters[1].value", "-0.5, outside the range [0.0, 50.0]", "/parameters/1/value", "-0.5"),
                bad("parameters[1].value", "51.0, outside the range [0.0, 50.0]", "/parameters/1/value", "51"),
                // no value given: the default 0 of a variation parameter must lie in the range
                bad("parameters[2].range", "[1.0, 3.0] does not contain the default value 0.0",
                        "/parameters/2/range", "[1, 3]"),
                bad("parameters[0].range", "[5.0, 5.0], lo must be < hi", "/parameters/0/range", "[5, 5]"),
                bad("parameters[0].range", "3 values, expected 2", "/parameters/0/range", "[0, 1, 2]"),
                bad("parameters[0].range[1]", "expected a number, found null", "/parameters/0/range/1", "null"),
                bad("parameters[3].fixed", "expected true or false, found a string", "/parameters/3/fixed", "\"yes\""),
                // Poisson constraint: value > 0 and a range not reaching below 0
                bad("parameters[2].constraint", "a poisson constraint needs a value > 0, the value is 0.0",
                        "/parameters/2/constraint", "{\"type\": \"poisson\", \"relative\": 0.1}"),
                bad("parameters[0].constraint", "the range starts at -2.0",
                        "/parameters/0/constraint", "{\"type\": \"poisson\", \"relative\": 0.1}"),
                bad("parameters[2].constraint", "the range starts at -6.0", "/parameters/2/value", "1",
                        "/parameters/2/constraint", "{\"type\": \"poisson\", \"relative\": 0.1}"),
                bad("parameters[1].constraint.relative", "0.0, must be > 0", "/parameters/1/constraint/relative", "0"),
                bad("parameters[1].constraint.relative", "required key is missing",
                        "/parameters/1/constraint/relative", REMOVE),
                bad("parameters[1].constraint.width", "unknown key", "/parameters/1/constraint/width", "1"),
                // Gaussian width > 0
                bad("parameters[2].constraint.width", "0.0, must be > 0", "/parameters/2/constraint/width", "0"),
                bad("parameters[2].constraint.width", "-1.0, must be > 0", "/parameters/2/constraint/width", "-1"),
                bad("parameters[2].constraint.relative", "unknown key", "/parameters/2/constraint/relative", "1"),
                bad("parameters[1].constraint.type", "\"lognormal\", expected \"gaussian\" or \"poisson\"",
                        "/parameters/1/constraint/type", "\"lognormal\""),
                bad("parameters[1].constraint.type", "required key is missing", "/parameters/1/constraint/type", REMOVE),
                bad("parameters[1].constraint", "expected a constraint object or null, found a string",
                        "/parameters/1/constraint", "\"poisson\""),
                // mcstat: names: only the generated ones (sr bins 0 and 1, see ModelJsonFixtures)
                bad("parameters[3].name", "\"mcstat:sr:2\" is not one of the generated MC-statistics parameters",
                        "/parameters/3/name", "\"mcstat:sr:2\""),
                bad("parameters[3].name", "is not one of the generated", "/parameters/3/name", "\"mcstat:cr:0\""),
                bad("parameters[3].name", "is not one of the generated", "/parameters/3/name", "\"mcstat:sr\""),
                // a threshold above δ_0 = 0.0196 removes γ_0, which parameters[3] names
                bad("parameters[3].name", "\"mcstat:sr:0\" is not one of the generated",
                        "/options/mcStatThreshold", "0.05"),
                // ---- groups
                bad("groups.theory[1]", "\"ghost\" is not a parameter of the model", "/groups/theory/1", "\"ghost\""),
                bad("groups.mcStatistics[1]", "\"mcstat:sr:2\" is not one of the generated",
                        "/groups/mcStatistics/1", "\"mcstat:sr:2\""),
                bad("groups.bad name", "\"bad name\", a name must match", "/groups/bad name", "[\"lumi\"]"),
                bad("groups.theory", "expected an array of strings, found a string", "/groups/theory", "\"lumi\""),
                bad("groups", "expected an object of group name to an array of parameter names, found an array",
                        "/groups", "[]"),
                // ---- POI
                bad("poi", "\"nu\" is not a parameter of the model", "/poi", "\"nu\""),
                bad("poi", "expected a string, found null", "/poi", "null"),
                // ---- labels: number or string
                bad("labels.mass", "expected a number or a string, found an object", "/labels/mass", "{}"),
                bad("labels.blinded", "expected a number or a string, found a boolean", "/labels/blinded", "true"),
                // ---- options
                bad("options.mcStatThreshold", "-0.1, must be >= 0", "/options/mcStatThreshold", "-0.1"),
                bad("options.mcStatConstraint", "\"uniform\", expected \"gaussian\" or \"poisson\"",
                        "/options/mcStatConstraint", "\"uniform\""),
                bad("options.pruneBelow", "-1.0, must be >= 0", "/options/pruneBelow", "-1"),
                bad("options.maxIterations", "unknown key", "/options/maxIterations", "100"));
    }

    private static Arguments bad(String path, String wording, String... edits) {
        return Arguments.of(path, wording, edits);
    }

    @ParameterizedTest(name = "{0}: {1}")
    @MethodSource("badModels")
    void refusesWithPathAndRule(String path, String wording, String[] edits) {
        String json = edited(edits);
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, SRC));
        assertEquals(path, e.path(), e.getMessage());
        assertEquals(SRC, e.file());
        String message = e.getMessage();
        assertTrue(message.startsWith(SRC + ": " + path + ": "), message);
        assertTrue(message.contains(wording), message);
        assertFalse(message.contains("\n"), message);
    }

    @Test
    void baseModelIsValid() {
        // guards the cases above: each must break exactly the rule it names, not the base
        Model m = ModelReader.parse(ModelJsonFixtures.BASE, SRC);
        assertEquals("diphoton-1500", m.name());
    }

    @Test
    void namesOfAllowedCharactersUpTo128AreAccepted() {
        String longest = "Az09_.:+-".repeat(14) + "ab";            // 128 characters
        assertEquals(128, longest.length());
        Model m = ModelReader.parse(edited("/name", "\"" + longest + "\""), SRC);
        assertEquals(longest, m.name());
    }

    @Test
    void generatedMcStatNamesAreParametersOfGroupsAndEntries() {
        // mcstat:sr:1 exists (δ_1 = 0.0141 > 0.01), so it may be overridden and grouped
        Model m = ModelReader.parse(edited("/parameters/5", "{\"name\": \"mcstat:sr:1\", \"range\": [0.5, 2]}"), SRC);
        assertEquals("mcstat:sr:1", m.parameters().get(5).name());
    }

    @Test
    void parameterUsedAsFactorAndInVariationTakesVariationDefaults() {
        // mu also in a variation: its defaults become value 0, range [-6, 6], so 7 is out of range
        String json = edited("/parameters/0", "{\"name\": \"mu\", \"value\": 7}",
                SIG + "/variations/1", "{\"parameter\": \"mu\", \"norm\": {\"down\": 0.9, \"up\": 1.1}}");
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(json, SRC));
        assertEquals("bad.json: parameters[0].value: 7.0, outside the range [-6.0, 6.0]", e.getMessage());
    }

    @Test
    void poissonConstraintOnAFactorWithDefaultRangeIsAccepted() {
        // factor defaults: value 1, range [0, 50]; the range starts at 0, not below
        Model m = ModelReader.parse(ModelJsonFixtures.BASE, SRC);
        assertTrue(m.parameters().get(1).constraint() instanceof ParameterSpec.Poisson);
    }

    @Test
    void validatorChecksRecordsBuiltInCode() {
        Model m = ModelReader.parse(ModelJsonFixtures.BASE, SRC);
        Channel sr = m.channels().get(0);
        Sample nanSample = new Sample("nan", new double[] {1, Double.NaN, 1}, null, null, null);
        Channel bad = new Channel(sr.name(), null, sr.edges(), sr.observed(), java.util.List.of(nanSample));
        Model built = new Model(m.format(), m.name(), null, null, java.util.List.of(bad), null, null, null, null);
        ModelException e = assertThrows(ModelException.class, () -> ModelValidator.validate(built, null));
        assertEquals("channels[0].samples[0].yields[1]: NaN, must be finite and >= 0", e.getMessage());
    }
}
