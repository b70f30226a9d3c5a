package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

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

    /** Two free factors on one sample next to the signal: the best fit does not converge. */
    private Path failingModel() throws IOException {
        Path p = dir.resolve("failing.json");
        Files.writeString(p, "{\"format\": \"plumb-model/1\", \"name\": \"failing\", \"poi\": \"mu\", \"channels\": ["
                + "{\"name\": \"sr\", \"edges\": [0, 1, 2, 3], \"observed\": [12, 20, 9], \"samples\": ["
                + "{\"name\": \"sig\", \"yields\": [1, 4, 1], \"factors\": [\"mu\"]},"
                + "{\"name\": \"bkg\", \"yields\": [10, 15, 8], \"factors\": [\"a\", \"b\"]}]}]}");
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
}
