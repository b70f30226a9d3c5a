package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/**
 * One rule for result files on exit status 1, whatever the command: the --json file is written,
 * with "converged": false and the one-line "failure" also printed on standard error.
 */
class ExitOneRuleTest {

    @TempDir
    Path dir;

    /** A free factor on a sample with no yield in any bin: nothing fixes it, and the best fit does not converge. */
    private Path failingModel() throws IOException {
        Path p = dir.resolve("failing.json");
        Files.writeString(p, "{\"format\": \"plumb-model/1\", \"name\": \"failing\", \"poi\": \"mu\", \"channels\": ["
                + "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"sig\", \"yields\": [1, 4, 1], \"factors\": [\"mu\"]},"
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\"]},"
                + "{\"name\": \"ghost\", \"yields\": [0, 0, 0], \"factors\": [\"b\"]}]}]}");
        return p;
    }

    @ParameterizedTest
    @ValueSource(strings = {"fit", "impacts", "scan", "discovery", "limit", "gof", "yields"})
    void aFailedComputationStillWritesItsResultFileWithTheFailure(String command) throws IOException {
        Path model = failingModel();
        Path out = dir.resolve(command + ".json");
        var r = run(command, model.toString(), "--json", out.toString());
        assertEquals(ExitCodes.FAILED, r.status(), r.err());
        assertTrue(Files.exists(out), "the result file exists on exit 1");
        JsonNode j = CommandLineTestSupport.readJson(out);
        assertFalse(j.get("converged").asBoolean(true));
        String failure = j.get("failure").asText();
        assertTrue(failure.contains("did not converge"), failure);
        assertTrue(r.err().contains(failure), r.err());
        assertFalse(r.err().contains("internal error"), r.err());
    }

    /** The same rule for the commands that exit 1 for other reasons than a failed fit. */
    @Test
    void checkStrictAndInjectWriteTheirResultWithTheFailure() throws IOException {
        Path lint = dir.resolve("lint.json");
        Files.writeString(lint, "{\"format\": \"plumb-model/1\", \"name\": \"lint\", \"channels\": [{\"name\": \"sr\", "
                + "\"observed\": [98, 52], \"samples\": [{\"name\": \"bkg\", \"yields\": [100, 50], \"factors\": [\"k\"], "
                + "\"variations\": [{\"parameter\": \"a\", \"norm\": {\"down\": 0.9995, \"up\": 1.0005}}]}]}]}");
        Path out = dir.resolve("check.json");
        var r = run("check", lint.toString(), "--strict", "--json", out.toString());
        assertEquals(ExitCodes.FAILED, r.status(), r.err());
        JsonNode j = CommandLineTestSupport.readJson(out);
        assertEquals(1, j.get("warnings").size(), "the full result is kept");
        assertFalse(j.get("converged").asBoolean(true));
        assertEquals("--strict: 1 warning", j.get("failure").asText());
        assertEquals("plumb check: --strict: 1 warning", r.err().strip());
        // without --strict the same model passes, and the file has no failure key
        assertEquals(ExitCodes.OK, run("check", lint.toString(), "--json", out.toString()).status());
        assertFalse(CommandLineTestSupport.readJson(out).has("failure"));

        Path injected = dir.resolve("inject.json");
        r = run("inject", failingModel().toString(), "--mu", "1", "--toys", "2", "--threads", "1", "--json", injected.toString());
        assertEquals(ExitCodes.FAILED, r.status(), r.err());
        j = CommandLineTestSupport.readJson(injected);
        assertTrue(j.has("summaries") || j.size() > 2, "the full result is kept: " + j);
        assertFalse(j.get("converged").asBoolean(true));
        String failure = j.get("failure").asText();
        assertTrue(failure.contains("no toy fit at mu = 1 converged"), failure);
        assertTrue(r.err().contains(failure), r.err());
    }

    /** Values of the options some commands require. */
    private static final Map<String, List<String>> REQUIRED = Map.of(
            "contour", List.of("--x", "mu", "--y", "a"),
            "inject", List.of("--mu", "1", "--toys", "2"));

    /**
     * Every command that takes a model and --json, taken from picocli's model of Main (so a new
     * command is included): run on a model whose fit fails, each that exits 1 must leave its
     * result file with the failure, and write the same to standard output with --json -.
     */
    @Test
    void everyModelCommandThatExitsOneLeavesItsFailureInItsResultFile() throws IOException {
        Path model = failingModel();
        Set<String> failed = new TreeSet<>();
        for (var e : Main.commandLine().getSubcommands().entrySet()) {
            var spec = e.getValue().getCommandSpec();
            if (spec.findOption("--json") == null || spec.positionalParameters().isEmpty()
                    || !spec.positionalParameters().get(0).paramLabel().equals("MODEL")) continue;
            String command = e.getKey();
            Path out = dir.resolve(command + "-all.json");
            List<String> args = new ArrayList<>(List.of(command, model.toString(), "--json", out.toString()));
            args.addAll(REQUIRED.getOrDefault(command, List.of()));
            if (spec.findOption("--threads") != null) args.addAll(List.of("--threads", "1"));
            var r = run(args.toArray(String[]::new));
            assertTrue(r.status() <= ExitCodes.FAILED, String.join(" ", args) + ": " + r.err());
            assertFalse(r.err().contains("internal error"), command + ": " + r.err());
            if (r.status() != ExitCodes.FAILED) continue;
            failed.add(command);
            assertTrue(Files.exists(out), command + ": the result file exists on exit 1");
            JsonNode j = CommandLineTestSupport.readJson(out);
            assertFalse(j.path("converged").asBoolean(true), command + ": " + j);
            String failure = j.path("failure").asText("");
            assertFalse(failure.isEmpty(), command + ": " + j);
            assertTrue(r.err().contains(failure), command + ": " + r.err());

            // '-' is standard output wherever --json is taken: the same result there, and nothing else
            args.set(args.indexOf(out.toString()), "-");
            var s = run(args.toArray(String[]::new));
            assertEquals(ExitCodes.FAILED, s.status(), command + " --json -: " + s.err());
            assertEquals(failure, s.json().path("failure").asText(), command + " --json -: " + s.out());
        }
        // the commands that fit must all fail on this model
        assertTrue(failed.containsAll(Set.of("fit", "impacts", "scan", "discovery", "limit", "gof", "yields", "inject",
                "contour", "sensitivity", "project")), "exit 1 from: " + failed);
    }
}
