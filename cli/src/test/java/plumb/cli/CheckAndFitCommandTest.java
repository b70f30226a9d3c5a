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

/** check and fit through the command line: exit codes and the JSON keys of docs/cli-contract.md. */
class CheckAndFitCommandTest {

    @TempDir
    Path dir;

    @Test
    void checkSummarisesTheDemoModel() {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("check", model.toString(), "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode j = r.json();
        assertTrue(j.get("valid").asBoolean());
        assertEquals(3, j.get("channels").asInt());
        assertEquals(34, j.get("bins").asInt());
        assertEquals(11, j.get("samples").asInt());
        assertEquals(55, j.get("parameters").asInt());
        assertTrue(j.get("warnings").isArray());
        assertEquals(640, j.get("labels").get("mass").asDouble());
    }

    @Test
    void checkCountsInTheSingular() throws IOException {
        // one channel, one bin, one sample with one free factor and one norm variation that is one-sided (a warning)
        Path model = dir.resolve("one.json");
        Files.writeString(model, """
                {"format": "plumb-model/1", "name": "one", "poi": "mu", "channels": [{"name": "sr", "edges": [0, 1], "observed": [5],
                  "samples": [{"name": "sig", "yields": [4], "factors": ["mu"],
                    "variations": [{"parameter": "eff", "norm": {"down": 1.05, "up": 1.1}}]}]}]}
                """);
        var r = run("check", model.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("  1 channel, 1 bin, 1 sample\n"), r.out());
        assertTrue(r.out().contains("  2 parameters: 1 free factor, 1 nuisance parameter, 0 MC-statistics parameters\n"), r.out());
        assertTrue(r.out().contains("  1 warning:\n"), r.out());
    }

    @Test
    void fitWritesTheContractKeys() throws IOException {
        Path model = CommandLineTestSupport.demoModel(dir);
        Path out = dir.resolve("fit.json");
        var r = run("fit", model.toString(), "--json", out.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("mu"), r.out());
        JsonNode j = new com.fasterxml.jackson.databind.ObjectMapper().readTree(out.toFile());
        assertTrue(j.get("converged").asBoolean());
        assertEquals("observed", j.get("data").asText());
        assertTrue(j.get("nll").isNumber());
        JsonNode mu = j.get("parameters").get(0);
        assertEquals("mu", mu.get("name").asText());
        for (String key : new String[] {"value", "error", "prefitValue"}) assertTrue(mu.get(key).isNumber(), key);
        for (String key : new String[] {"prefitWidth", "pull", "constraint"}) assertTrue(mu.get(key).isNull(), key);
        JsonNode lumi = j.get("parameters").get(1);
        assertEquals(1.0, lumi.get("prefitWidth").asDouble());
        assertEquals(lumi.get("value").asDouble(), lumi.get("pull").asDouble(), 1e-12); // (value − 0)/1
        JsonNode corr = j.get("correlation");
        int n = corr.get("names").size();
        assertEquals(n, corr.get("matrix").size());
        assertEquals(1.0, corr.get("matrix").get(0).get(0).asDouble(), 1e-9);
        assertTrue(j.get("timing").get("seconds").isNumber());
        assertTrue(j.get("timing").get("evaluations").asInt() > 0);
    }

    @Test
    void fixHoldsAParameterAndAsimovRecoversThePoi() {
        Path model = CommandLineTestSupport.demoModel(dir);
        var fixed = run("fit", model.toString(), "--fix", "mu=2", "--json", "-");
        assertEquals(0, fixed.status(), fixed.err());
        JsonNode mu = fixed.json().get("parameters").get(0);
        assertEquals(2.0, mu.get("value").asDouble());
        assertEquals(0.0, mu.get("error").asDouble());
        // Asimov data at μ = 1.5: the fit returns 1.5 (Cowan et al. 2011: the Asimov set reproduces its parameters)
        var asimov = run("fit", model.toString(), "--data", "asimov", "--asimov-poi", "1.5", "--json", "-");
        assertEquals(0, asimov.status(), asimov.err());
        assertEquals("asimov", asimov.json().get("data").asText());
        assertEquals(1.5, asimov.json().get("parameters").get(0).get("value").asDouble(), 1e-3);
    }

    @Test
    void fixHoldsAnMcStatisticsParameter() {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("fit", model.toString(), "--fix", "mcstat:sr_tight:9=1.05", "--json", "-");
        assertEquals(0, r.status(), r.err());
        JsonNode gamma = null;
        for (JsonNode p : r.json().get("parameters")) if (p.get("name").asText().equals("mcstat:sr_tight:9")) gamma = p;
        assertEquals(1.05, gamma.get("value").asDouble());
        assertEquals(0.0, gamma.get("error").asDouble());
        assertTrue(gamma.get("fixed").asBoolean());
    }

    @Test
    void badOptionsExitTwoWithOneLine() {
        Path model = CommandLineTestSupport.demoModel(dir);
        String[][] cases = {
                {"fit", model.toString(), "--fix", "nosuch=1"},
                {"fit", model.toString(), "--fix", "mu=abc"},
                {"fit", model.toString(), "--fix", "mu=99"},
                {"fit", model.toString(), "--optimizer", "magic"},
                {"fit", model.toString(), "--data", "simulated"},
                {"fit", dir.resolve("missing.json").toString()},
                {"fit"},
        };
        for (String[] args : cases) {
            var r = run(args);
            assertEquals(2, r.status(), String.join(" ", args) + ": " + r.err());
            assertEquals(1, r.err().strip().lines().count(), r.err());
            assertFalse(r.err().contains("Exception"), r.err());
        }
    }

    @Test
    void aFitThatCannotBeResolvedExitsOne() throws IOException {
        // a free factor on a sample with no yield: nothing determines it, the Hessian is singular
        Path model = dir.resolve("singular.json");
        Files.writeString(model, """
                {"format": "plumb-model/1", "name": "singular", "poi": "mu",
                 "channels": [{"name": "sr", "observed": [12, 9],
                   "samples": [{"name": "signal", "yields": [2, 1], "factors": ["mu"]},
                               {"name": "ghost", "yields": [0, 0], "factors": ["k"]},
                               {"name": "background", "yields": [10, 8]}]}]}
                """);
        var r = run("fit", model.toString(), "--json", dir.resolve("out.json").toString());
        assertEquals(1, r.status(), r.out());
        assertTrue(r.err().contains("did not converge"), r.err());
    }
}
