package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** fit, check and report on models with several minima and with a minimum on an interpolation kink. */
class SeveralMinimaCommandTest {

    @TempDir
    Path dir;

    /**
     * One bin, yield 100 at θ = 0, 125 at θ = −1 and 135 at θ = +1 under smooth interpolation, 125
     * seen: a minimum on each side of 0, the one at θ &gt; 0 deeper.
     */
    static final String TWO_MINIMA = """
            {"format": "plumb-model/1", "name": "two_minima", "channels": [{"name": "bin", "samples": [
              {"name": "bkg", "yields": [100], "variations": [{"parameter": "theta",
                "norm": {"down": 1.25, "up": 1.35}}]}],
              "observed": [125]}]}
            """;

    /** Two bins whose linear shape variation has its slopes swapped; data 10 % off each way: a minimum on the kink. */
    static final String KINK = """
            {"format": "plumb-model/1", "name": "kink", "channels": [{"name": "two_bins", "samples": [
              {"name": "bkg", "yields": [100, 100], "variations": [{"parameter": "theta",
                "shape": {"down": [80, 90], "up": [110, 120]}, "shapeInterpolation": "linear"}]}],
              "observed": [110, 90]}]}
            """;

    private Path write(String name, String json) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, json);
        return p;
    }

    /** A random model (test resource) whose fit from nominal ends in the higher of two minima. */
    private Path shippedCase(String name) throws IOException {
        try (var in = SeveralMinimaCommandTest.class.getResourceAsStream("/plumb/cli/cases/" + name)) {
            Path p = dir.resolve(name);
            Files.write(p, in.readAllBytes());
            return p;
        }
    }

    /**
     * The values quoted for the two random models, found with an independent implementation of the
     * likelihood: the fit with mu held at 0 at −ln L = 34.490839, the expected band
     * [2.10, 2.84, 3.99, 5.65, 7.75] (model a); the scan point mu = 10 on the Asimov data set at
     * mu = 0 at −ln L = 39.895398 and the +2σ expected limit 9.35 (model b).
     */
    @Test
    void theCommandsReachTheLowerMinimaOfTheShippedCases() throws IOException {
        Path a = shippedCase("several-minima-a.json"), b = shippedCase("several-minima-b.json");
        var fit = run("fit", a.toString(), "--fix", "mu=0", "--json", "-");
        assertEquals(0, fit.status(), fit.err());
        assertEquals(34.490839, fit.json().get("nll").asDouble(), 1e-6);
        assertTrue(fit.json().get("severalMinima").asBoolean());
        assertEquals(34.536152 - 34.490839, fit.json().get("otherMinima").get(0).get("nllAboveBest").asDouble(), 2e-6);

        JsonNode bands = run("limit", a.toString(), "--json", "-").json().get("expected");
        String[] keys = {"minus2", "minus1", "median", "plus1", "plus2"};
        double[] quoted = {2.10, 2.84, 3.99, 5.65, 7.75};
        for (int k = 0; k < keys.length; k++) assertEquals(quoted[k], bands.get(keys[k]).asDouble(), 0.005, keys[k]);

        String[] asimov = {"--data", "asimov", "--asimov-poi", "0"};
        double bestNll = run(concat(new String[] {"fit", b.toString(), "--json", "-"}, asimov)).json().get("nll").asDouble();
        JsonNode points = run(concat(new String[] {"scan", b.toString(), "--range", "0:10", "--json", "-"}, asimov))
                .json().get("points");
        JsonNode last = points.get(points.size() - 1);
        assertEquals(10, last.get("value").asDouble());
        assertEquals(39.895398 - bestNll, last.get("nllAboveMin").asDouble(), 1e-6);
        assertEquals(9.35, run("limit", b.toString(), "--json", "-").json().get("expected").get("plus2").asDouble(), 0.005);
    }

    private static String[] concat(String[] a, String[] b) {
        String[] out = java.util.Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }

    @Test
    void fitReportsTheOtherMinimum() throws IOException {
        Path model = write("two.json", TWO_MINIMA);
        var r = run("fit", model.toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode j = r.json();
        assertTrue(j.get("severalMinima").asBoolean());
        double best = j.get("nll").asDouble();
        assertTrue(j.get("parameters").get(0).get("value").asDouble() > 0.5, "the deeper minimum at θ > 0");
        JsonNode other = j.get("otherMinima").get(0);
        assertTrue(other.get("nllAboveBest").asDouble() > 0.01, other.toString());
        JsonNode d = other.get("differences").get(0);
        assertEquals("theta", d.get("name").asText());
        assertTrue(d.get("value").asDouble() < -0.5, d.toString());
        // From the other minimum's θ, the fit with θ held there lies exactly ΔNLL higher.
        var held = run("fit", model.toString(), "--fix", "theta=" + d.get("value").asDouble(), "--json", "-");
        assertEquals(best + other.get("nllAboveBest").asDouble(), held.json().get("nll").asDouble(), 1e-6);

        var text = run("fit", model.toString());
        assertTrue(text.out().contains("several minima: -ln L has 1 other minimum"), text.out());
    }

    @Test
    void randomStartsAreCountedAndBadCountsRefused() throws IOException {
        Path model = write("two.json", TWO_MINIMA);
        var r = run("fit", model.toString(), "--starts", "8", "--seed", "3", "--json", "-");
        assertEquals(0, r.status(), r.err());
        assertEquals(8, r.json().get("starts").asInt());
        assertTrue(r.json().get("severalMinima").asBoolean());
        assertEquals(r.json().get("nll").asDouble(), run("fit", model.toString(), "--json", "-").json().get("nll").asDouble(), 1e-9);
        var bad = run("fit", model.toString(), "--starts", "-1");
        assertEquals(2, bad.status());
        assertTrue(bad.err().contains("--starts"), bad.err());
    }

    @Test
    void checkWarnsAboutTheOneSidedVariation() throws IOException {
        var r = run("check", write("two.json", TWO_MINIMA).toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        String warnings = r.json().get("warnings").toString();
        assertTrue(warnings.contains("bin/bkg: norm variation of theta is one-sided"), warnings);
        assertTrue(warnings.contains("several minima in theta"), warnings);
    }

    @Test
    void aParameterOnAKinkIsFlaggedWithItsProfileInterval() throws IOException {
        Path model = write("kink.json", KINK);
        var r = run("fit", model.toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode theta = r.json().get("parameters").get(0);
        assertTrue(theta.get("atKink").asBoolean());
        assertTrue(theta.get("errorLow").asDouble() < 0, theta.toString());
        assertTrue(theta.get("errorHigh").asDouble() > 0, theta.toString());
        assertFalse(r.json().get("severalMinima").asBoolean());
        var text = run("fit", model.toString());
        assertTrue(text.out().contains("on kink"), text.out());
        assertTrue(text.out().contains("profile-likelihood intervals"), text.out());
    }
}
