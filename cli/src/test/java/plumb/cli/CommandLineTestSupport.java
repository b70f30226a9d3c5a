package plumb.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** Runs the command line in-process with captured output, for tests. */
public final class CommandLineTestSupport {

    private CommandLineTestSupport() {
    }

    /** Exit status and what the command printed. */
    public record Run(int status, String out, String err) {
        /** Standard output parsed as JSON (for {@code --json -}). */
        public JsonNode json() {
            try {
                return new ObjectMapper().readTree(out);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    public static Run run(String... args) {
        StringWriter out = new StringWriter(), err = new StringWriter();
        int status = Main.execute(args, new PrintWriter(out), new PrintWriter(err));
        return new Run(status, out.toString(), err.toString());
    }

    /** JSON text parsed. */
    public static JsonNode readJsonText(String text) {
        try {
            return new ObjectMapper().readTree(text);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A JSON file parsed. */
    public static JsonNode readJson(Path file) {
        try {
            return new ObjectMapper().readTree(file.toFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The demo model copied to a file in {@code dir}. */
    public static Path demoModel(Path dir) {
        try (var in = plumb.models.DemoModel.openStream()) {
            Path p = dir.resolve("demo.json");
            Files.write(p, in.readAllBytes());
            return p;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
