package plumb.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The rule of docs/model-format.md, "MC-statistics term": δ_b = sqrt(Σ mcError²)/Σ n over the
 * samples that give mcError; γ_b exists when δ_b > mcStatThreshold and Σ n > 0. Expected values
 * are that formula worked by hand on {@link ModelJsonFixtures#BASE}.
 */
class McStatBinsTest {

    private final Model base = ModelReader.parse(ModelJsonFixtures.BASE, "base.json");

    @Test
    void relativeErrorSumsTheSamplesThatGiveMcError() {
        Channel sr = base.channels().get(0);
        // tolerance: a few ulps of a sum of two squares, a square root and a division
        assertEquals(Math.sqrt(0.25 + 4) / 105, McStatBins.relativeError(sr, 0), 1e-16);
        assertEquals(Math.sqrt(2.0) / 100, McStatBins.relativeError(sr, 1), 1e-16);
        assertEquals(Math.sqrt(0.16 + 0.01) / 64, McStatBins.relativeError(sr, 2), 1e-16);
        assertEquals(0.019634, McStatBins.relativeError(sr, 0), 1e-6);   // the figure quoted in ModelJsonFixtures
    }

    @Test
    void allBinsAtOnceEqualBinByBin() {
        for (Channel ch : base.channels()) {
            double[] all = McStatBins.relativeErrors(ch);
            assertEquals(ch.bins(), all.length);
            for (int b = 0; b < all.length; b++) assertEquals(McStatBins.relativeError(ch, b), all[b], 0.0);
        }
    }

    @Test
    void onlyBinsAboveTheThresholdGetAGamma() {
        Channel sr = base.channels().get(0);
        assertTrue(McStatBins.exists(sr, 0, base.options()));
        assertTrue(McStatBins.exists(sr, 1, base.options()));
        assertFalse(McStatBins.exists(sr, 2, base.options()));           // δ_2 = 0.0064 < 0.01
        assertEquals(List.of("mcstat:sr:0", "mcstat:sr:1"), McStatBins.names(base));
    }

    @Test
    void defaultThresholdZeroGivesEveryBinWithPositiveErrorAGamma() {
        Model m = ModelReader.parse(ModelJsonFixtures.edited("/options", "{}"), "m.json");
        assertEquals(List.of("mcstat:sr:0", "mcstat:sr:1", "mcstat:sr:2"), McStatBins.names(m));
    }

    @Test
    void noGammaWithoutMcErrorOrWithZeroYieldsOrZeroError() {
        Model m = ModelReader.parse("""
                {"format": "plumb-model/1", "name": "m", "channels": [
                  {"name": "a", "samples": [{"name": "s", "yields": [0, 5, 5], "mcError": [1, 0, 0.5]},
                                            {"name": "t", "yields": [9, 9, 9]}]},
                  {"name": "b", "samples": [{"name": "s", "yields": [3]}]}]}
                """, "m.json");
        Channel a = m.channels().get(0);
        assertTrue(Double.isNaN(McStatBins.relativeError(a, 0)));    // Σ n = 0 over the mcError samples
        assertEquals(0.0, McStatBins.relativeError(a, 1));           // δ = 0 is not above the threshold 0
        assertEquals(0.1, McStatBins.relativeError(a, 2), 1e-16);    // sample t gives no mcError: not summed
        assertTrue(Double.isNaN(McStatBins.relativeError(m.channels().get(1), 0)));
        assertArrayEquals(new double[] {Double.NaN, 0.0, 0.1}, McStatBins.relativeErrors(a), 1e-16);
        assertEquals(List.of("mcstat:a:2"), McStatBins.names(m));
    }

    @Test
    void parameterKindsInOrderOfFirstUseThenGammas() {
        Map<String, ParameterKind> kinds = ParameterKind.of(base);
        assertEquals(List.of("mu", "lumi", "bkgNorm", "photonScale", "mcstat:sr:0", "mcstat:sr:1"),
                List.copyOf(kinds.keySet()));
        assertEquals(ParameterKind.FACTOR, kinds.get("mu"));
        assertEquals(ParameterKind.VARIATION, kinds.get("lumi"));
        assertEquals(ParameterKind.FACTOR, kinds.get("bkgNorm"));
        assertEquals(ParameterKind.VARIATION, kinds.get("photonScale"));
        assertEquals(ParameterKind.MC_STATISTICS, kinds.get("mcstat:sr:1"));
    }

    @Test
    void factorAlsoUsedInAVariationIsAVariationParameter() {
        Model m = ModelReader.parse(ModelJsonFixtures.edited("/channels/1/samples/0/variations",
                "[{\"parameter\": \"bkgNorm\", \"norm\": {\"down\": 0.9, \"up\": 1.1}}]",
                // its Poisson constraint would now be refused: the variation default value is 0
                "/parameters/1/constraint", "null"), "m.json");
        assertEquals(ParameterKind.VARIATION, ParameterKind.of(m).get("bkgNorm"));
    }

    @Test
    void defaultsOfTheFormatPage() {
        // docs/model-format.md, "Parameters": value and range per kind
        assertEquals(List.of(1.0, 0.0, 50.0), defaults(ParameterKind.FACTOR));
        assertEquals(List.of(0.0, -6.0, 6.0), defaults(ParameterKind.VARIATION));
        assertEquals(List.of(1.0, 1e-8, 20.0), defaults(ParameterKind.MC_STATISTICS));
    }

    private static List<Double> defaults(ParameterKind k) {
        return List.of(k.defaultValue(), k.defaultLow(), k.defaultHigh());
    }
}
