package plumb.engine.model;

import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import plumb.cli.Main;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Every bad-model case of the engine's {@link ModelRulesTest} (one per rule of docs/model-format.md)
 * through the command line: exit status 2, one line on standard error naming the file and the
 * JSON path, nothing on standard output, no result file (docs/cli-contract.md). The class sits in
 * the engine's test package to reuse its case table from the engine's test jar.
 */
class BadModelCommandLineTest {

    @TempDir
    Path dir;

    @ParameterizedTest(name = "{0}: {1}")
    @MethodSource("plumb.engine.model.ModelRulesTest#badModels")
    void checkAndFitExitWithStatusTwoAndThePath(String path, String wording, String[] edits) throws IOException {
        Path model = dir.resolve("bad.json");
        Files.writeString(model, ModelJsonFixtures.edited(edits));
        for (String command : new String[] {"check", "fit"}) {
            Path result = dir.resolve(command + ".json");
            StringWriter out = new StringWriter(), err = new StringWriter();
            int status = Main.execute(new String[] {command, model.toString(), "--json", result.toString()},
                    new PrintWriter(out), new PrintWriter(err));
            String message = err.toString().strip();
            assertEquals(2, status, message);
            assertFalse(message.contains("\n"), "one line: " + message);
            assertTrue(message.contains(model.toString() + ": " + path + ": "), message);
            assertTrue(message.contains(wording), message);
            assertEquals("", out.toString());
            assertFalse(Files.exists(result), "no result file for a bad model");
        }
    }
}
