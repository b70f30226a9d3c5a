package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;
import static plumb.cli.CommandLineTestSupport.run;

/**
 * Output files never clobber: inputs are refused as outputs, devices and pipes are written into
 * rather than replaced, links are kept; write errors name their cause. And the messages around
 * them: escaped names, unknown commands, --debug, a model from standard input.
 */
class OutputSafetyTest {

    @TempDir
    Path dir;

    private void assertOneLineRefusal(CommandLineTestSupport.Run r, String expected) {
        assertEquals(ExitCodes.BAD_INPUT, r.status(), r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains(expected), r.err());
    }

    @Test
    void anOutputThatIsTheModelIsRefusedAndTheModelKept() throws IOException {
        Path model = CommandLineTestSupport.demoModel(dir);
        byte[] before = Files.readAllBytes(model);
        Files.createSymbolicLink(dir.resolve("link.json"), model.getFileName());
        Files.createLink(dir.resolve("hard.json"), model);
        String[][] cases = {
                {"fit", model.toString(), "--json", model.toString()},
                {"fit", model.toString(), "--json", dir.resolve("link.json").toString()},
                {"fit", model.toString(), "--json", dir.resolve("hard.json").toString()},
                {"fit", model.toString(), "--json", dir.resolve("sub/../demo.json").toString()},
                {"yields", model.toString(), "--out", model.toString(), "--format", "csv"},
                {"limit", model.toString(), "--csv", model.toString()},
                {"limit", dir.toString(), "--json", model.toString()},
                {"check", model.toString(), "--json", model.toString()},
        };
        Files.createDirectories(dir.resolve("sub"));
        for (String[] args : cases) {
            var r = run(args);
            assertOneLineRefusal(r, "is the input file");
            assertArrayEquals(before, Files.readAllBytes(model), String.join(" ", args));
        }
        assertTrue(Files.isSymbolicLink(dir.resolve("link.json")));
    }

    @Test
    void twoOutputsOnOneFileAreRefused() {
        Path model = CommandLineTestSupport.demoModel(dir);
        Path out = dir.resolve("same.txt");
        var r = run("limit", model.toString(), "--json", out.toString(), "--csv", out.toString());
        assertOneLineRefusal(r, "is also the output of --json");
        assertFalse(Files.exists(out));
    }

    @Test
    void aPipeIsWrittenIntoNotReplaced() throws Exception {
        Path model = CommandLineTestSupport.demoModel(dir);
        Path fifo = dir.resolve("out.fifo");
        assumeTrue(new ProcessBuilder("mkfifo", fifo.toString()).start().waitFor() == 0, "mkfifo available");
        Path link = dir.resolve("link-to-fifo");
        Files.createSymbolicLink(link, fifo);
        for (Path target : new Path[] {fifo, link}) {
            CompletableFuture<byte[]> read = CompletableFuture.supplyAsync(() -> {
                try (InputStream in = Files.newInputStream(fifo)) {
                    return in.readAllBytes();
                } catch (IOException e) {
                    throw new java.io.UncheckedIOException(e);
                }
            });
            var r = run("check", model.toString(), "--json", target.toString());
            assertEquals(0, r.status(), r.err());
            String text = new String(read.get(20, TimeUnit.SECONDS), java.nio.charset.StandardCharsets.UTF_8);
            assertTrue(text.contains("\"valid\" : true"), text);
            assertFalse(Files.isRegularFile(fifo, java.nio.file.LinkOption.NOFOLLOW_LINKS), "the FIFO is still a FIFO");
            assertTrue(Files.isSymbolicLink(link));
        }
    }

    @Test
    void aLinkToARegularFileStaysALinkAndItsFileIsReplaced() throws IOException {
        Path model = CommandLineTestSupport.demoModel(dir);
        Path real = dir.resolve("result.json");
        Files.writeString(real, "old");
        Path link = dir.resolve("link.json");
        Files.createSymbolicLink(link, real.getFileName());
        var r = run("check", model.toString(), "--json", link.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(Files.isSymbolicLink(link));
        assertTrue(Files.readString(real).contains("\"valid\""));
    }

    @Test
    void writeErrorsNameTheirCause() throws IOException {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("check", model.toString(), "--json", model + "/x.json");
        assertOneLineRefusal(r, "cannot write " + model + "/x.json: not a directory");
        Files.createDirectories(dir.resolve("folder"));
        r = run("check", model.toString(), "--json", dir.resolve("folder").toString());
        assertOneLineRefusal(r, "folder: is a directory");
    }

    @Test
    void namesWithControlCharactersAreEscapedInMessages() {
        Path model = CommandLineTestSupport.demoModel(dir);
        var r = run("fit", model.toString(), "--fix", "a\u001b[2Jb\nc\u0007\r=1");
        assertOneLineRefusal(r, "--fix a\\e[2Jb\\nc\\u0007\\r=1: the model has no parameter");
        assertFalse(r.err().chars().anyMatch(c -> c < 0x20 && c != '\n'), r.err());
    }

    @Test
    void unknownCommandWithHelpIsRefusedAndListsTheCommands() {
        for (String[] args : new String[][] {{"nosuch", "--help"}, {"nosuch"}, {"--debug", "nosuch", "-h"}}) {
            var r = run(args);
            assertOneLineRefusal(r, "unknown command 'nosuch'");
            assertTrue(r.err().contains("check, fit, "), r.err());
            assertEquals("", r.out());
        }
        assertEquals(0, run("fit", "--help").status());
        assertEquals(0, run("--help").status());
    }

    @picocli.CommandLine.Command(name = "boom")
    static final class Boom implements Callable<Integer> {
        @Override
        public Integer call() {
            throw new IllegalStateException("broken");
        }
    }

    @Test
    void debugOutputDoesNotAskForDebug() {
        for (boolean debug : new boolean[] {false, true}) {
            var cl = Main.commandLine();
            cl.addSubcommand("boom", new Boom());
            StringWriter err = new StringWriter();
            cl.setErr(new PrintWriter(err));
            cl.setOut(new PrintWriter(new StringWriter()));
            int status = debug ? cl.execute("boom", "--debug") : cl.execute("boom");
            assertEquals(ExitCodes.FAILED, status);
            String first = err.toString().lines().findFirst().orElseThrow();
            assertTrue(first.startsWith("plumb boom: internal error: broken"), first);
            assertEquals(!debug, err.toString().contains("run with --debug"), err.toString());
            assertEquals(debug, err.toString().contains("IllegalStateException"), err.toString());
        }
    }

    @Test
    void aModelIsReadFromStandardInput() throws IOException {
        Path model = CommandLineTestSupport.demoModel(dir);
        InputStream saved = System.in;
        try {
            System.setIn(new ByteArrayInputStream(Files.readAllBytes(model)));
            var r = run("check", "-", "--json", "-");
            assertEquals(0, r.status(), r.err());
            assertTrue(r.json().get("valid").asBoolean());
            System.setIn(new ByteArrayInputStream("{\"format\":".getBytes(java.nio.charset.StandardCharsets.UTF_8)));
            r = run("fit", "-");
            assertOneLineRefusal(r, "plumb fit: standard input: line 1, column 11: not JSON");
        } finally {
            System.setIn(saved);
        }
    }
}
