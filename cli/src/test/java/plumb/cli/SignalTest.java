package plumb.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledOnOs;
import org.junit.jupiter.api.condition.OS;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.ModelWriter;
import plumb.models.SyntheticModels;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Commands killed from outside, run as a separate {@code java} process on this JVM's class path
 * (what the launcher runs, without the build step). {@link Process#destroy()} sends SIGTERM on
 * Linux, {@link Process#destroyForcibly()} SIGKILL.
 */
@EnabledOnOs(OS.LINUX)
class SignalTest {

    @TempDir
    static Path dir;
    static Path model;

    @BeforeAll
    static void smallModel() throws IOException {
        model = dir.resolve("small.json");
        ModelWriter.write(SyntheticModels.generate(1, 4, 2, 2, 3), model);
    }

    private static Process start(Path log, String... args) throws IOException {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Djava.awt.headless=true", "-cp", System.getProperty("java.class.path"), Main.class.getName()));
        cmd.addAll(List.of(args));
        return new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
    }

    private static List<Path> staging(Path parent, String name) throws IOException {
        try (Stream<Path> s = Files.list(parent)) {
            return s.filter(p -> p.getFileName().toString().startsWith(name + ".tmp-")).toList();
        }
    }

    /**
     * Starts a report and waits until its staging folder exists (the figures are being drawn; the
     * variation figures of --templates keep it there for seconds), then kills it.
     *
     * @return whether the process was caught while staging
     */
    private static boolean killWhileStaging(Path parent, boolean forcibly) throws Exception {
        Path log = parent.resolve("log-" + forcibly + ".txt");
        Process p = start(log, "report", model.toString(), "--out", parent.resolve("r").toString(),
                "--toys", "0", "--templates", "--threads", "1");
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(180);
        while (p.isAlive() && staging(parent, "r").isEmpty() && System.nanoTime() < deadline) Thread.sleep(5);
        boolean caught = p.isAlive() && !staging(parent, "r").isEmpty();
        if (forcibly) p.destroyForcibly();
        else p.destroy();
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the process ends");
        if (caught && !forcibly) assertEquals(128 + 15, p.exitValue(), Files.readString(log));
        return caught;
    }

    @Test
    void sigtermWhileStagingLeavesNoStagingFolderAndSigkillLeftoversAreSweptByTheNextRun() throws Exception {
        Path parent = Files.createDirectories(dir.resolve("term"));
        assertTrue(killWhileStaging(parent, false), "SIGTERM sent while the report was staging");
        assertEquals(List.of(), staging(parent, "r"), "the shutdown hook removed the staging folder");
        assertFalse(Files.exists(parent.resolve("r")), "no partial report folder");

        Path killed = Files.createDirectories(dir.resolve("kill"));
        assertTrue(killWhileStaging(killed, true), "SIGKILL sent while the report was staging");
        assertEquals(1, staging(killed, "r").size(), "SIGKILL runs no hook: the staging folder is left");
        assertFalse(Files.exists(killed.resolve("r")));
        // the next run for the same folder sweeps it
        var r = CommandLineTestSupport.run("report", model.toString(), "--out", killed.resolve("r").toString(),
                "--toys", "0", "--threads", "1");
        assertTrue(r.status() <= ExitCodes.FAILED, r.err());
        assertEquals(List.of(), staging(killed, "r"), "the stale staging folder was swept");
        assertTrue(Files.exists(killed.resolve("r/index.html")));
    }

    @Test
    void sigtermDuringInjectionToysLeavesNoFile() throws Exception {
        Path out = Files.createDirectories(dir.resolve("inject"));
        Path log = dir.resolve("inject-log.txt");
        Process p = start(log, "inject", model.toString(), "--mu", "1", "--toys", "1000000", "--threads", "1",
                "--json", out.resolve("inject.json").toString());
        Thread.sleep(3000);   // started, model read, toys running: a million of them take far longer
        assertTrue(p.isAlive(), "still running its million toys: " + Files.readString(log));
        p.destroy();
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the process ends on SIGTERM");
        assertEquals(128 + 15, p.exitValue());
        try (Stream<Path> left = Files.list(out)) {
            assertEquals(List.of(), left.toList(), "no result file and no temporary file");
        }
    }
}
