package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * The ./plumb launcher's first run builds quietly and without terminal escape codes, and a failed
 * build exits 3 (2 is kept for bad input): run on a
 * copy of the launcher with stand-ins for mvn (which prints colour codes, as Maven's console
 * library does) and java on the PATH.
 */
class LauncherTest {

    @TempDir
    Path dir;

    private static void script(Path file, String body) throws IOException {
        Files.writeString(file, "#!/usr/bin/env bash\n" + body);
        Files.setPosixFilePermissions(file, PosixFilePermissions.fromString("rwxr-xr-x"));
    }

    private String[] launch() throws Exception {
        return launch("--version");
    }

    private String[] launch(String... args) throws Exception {
        java.util.List<String> command = new java.util.ArrayList<>(java.util.List.of("bash", dir.resolve("plumb").toString()));
        command.addAll(java.util.List.of(args));
        ProcessBuilder pb = new ProcessBuilder(command).directory(dir.toFile());
        pb.environment().put("PATH", dir.resolve("bin") + ":" + System.getenv("PATH"));
        pb.redirectOutput(dir.resolve("out.txt").toFile()).redirectError(dir.resolve("err.txt").toFile());
        Process p = pb.start();
        assertTrue(p.waitFor(60, TimeUnit.SECONDS));
        return new String[] {Integer.toString(p.exitValue()), Files.readString(dir.resolve("out.txt")),
                Files.readString(dir.resolve("err.txt"))};
    }

    @Test
    void firstBuildIsQuietAndWithoutColourCodes() throws Exception {
        Path launcher = Path.of("..", "plumb");
        assumeTrue(Files.isRegularFile(launcher), "run from the cli module");
        Files.copy(launcher, dir.resolve("plumb"));
        Files.writeString(dir.resolve("pom.xml"), "<project/>");
        Files.createDirectories(dir.resolve("bin"));
        Files.createDirectories(dir.resolve("cli"));
        script(dir.resolve("bin/mvn"), "printf '\\033[0m\\033[1mBuilding\\033[m\\n'\n"
                + "[ -f fail ] && { printf '\\033[1;31m[ERROR] broken\\033[m\\n'; exit 1; }\n"
                + "mkdir -p cli/target && touch cli/target/plumb.jar\n");
        script(dir.resolve("bin/java"), "echo \"java $*\"\n");

        Files.writeString(dir.resolve("fail"), "");
        String[] failed = launch();
        assertEquals("3", failed[0], "a failed build is not bad input (2)");
        assertTrue(failed[2].contains("[ERROR] broken"), failed[2]);
        assertTrue(failed[2].endsWith("plumb: build failed\n"), failed[2]);
        assertFalse(failed[2].contains("\u001b"), failed[2]);

        Files.delete(dir.resolve("fail"));
        String[] built = launch();
        assertEquals("0", built[0], built[2]);
        assertEquals("plumb: building (mvn package -pl cli) ...\n", built[2]);
        assertTrue(built[1].startsWith("java ") && built[1].contains("plumb.jar --version"), built[1]);
        assertFalse((built[1] + built[2]).getBytes(StandardCharsets.UTF_8).length == 0);
    }

    /**
     * The class-data archive: made after a build by a training run (which lists the classes) and a
     * dump, under temporary names, used when it is newer than the jar, remade when the jar is
     * newer, and left out when either step fails (the command still runs, without it).
     */
    @Test
    void classDataArchiveIsMadeUsedAndRemade() throws Exception {
        Path launcher = Path.of("..", "plumb");
        assumeTrue(Files.isRegularFile(launcher), "run from the cli module");
        Files.copy(launcher, dir.resolve("plumb"));
        Files.writeString(dir.resolve("pom.xml"), "<project/>");
        Files.createDirectories(dir.resolve("bin"));
        Files.createDirectories(dir.resolve("cli/target"));
        Files.createDirectories(dir.resolve("models/src/main/resources/plumb/models"));
        Files.writeString(dir.resolve("models/src/main/resources/plumb/models/demo.json"), "{}");
        script(dir.resolve("bin/mvn"), "exit 0\n");
        Path jar = dir.resolve("cli/target/plumb.jar");
        Files.writeString(jar, "jar");
        Path archive = dir.resolve("cli/target/plumb.jsa");
        // a java that writes the class list of a training run unless the file "broken" exists (and
        // counts training runs), and the archive of a dump unless the file "nodump" exists
        script(dir.resolve("bin/java"), "dump=0; for a; do [ \"$a\" = -Xshare:dump ] && dump=1; done\n"
                + "for a; do case $a in\n"
                + "  -XX:DumpLoadedClassList=*) echo run >> " + dir.resolve("trainings") + "\n"
                + "    [ -f " + dir.resolve("broken") + " ] || echo classes > \"${a#*=}\";;\n"
                + "  -XX:SharedArchiveFile=*) [ $dump = 1 ] && [ ! -f " + dir.resolve("nodump") + " ] && echo archive > \"${a#*=}\";;\n"
                + "esac; done\n"
                + "echo \"java $*\"\n");

        for (String failure : new String[] {"broken", "nodump"}) {
            Files.writeString(dir.resolve(failure), "");
            String[] without = launch();
            assertEquals("0", without[0], without[2]);
            assertFalse(without[1].contains("SharedArchiveFile"), without[1]);
            assertFalse(Files.exists(archive));
            try (var files = Files.list(dir.resolve("cli/target"))) {
                assertEquals(1, files.count(), "no temporary class list or archive left behind");
            }
            Files.delete(dir.resolve(failure));
        }
        String[] with = launch();
        assertTrue(with[1].contains("-XX:SharedArchiveFile=") && with[1].contains("plumb.jsa -Xlog:cds=off"), with[1]);
        assertTrue(Files.exists(archive));
        assertEquals(3, Files.readAllLines(dir.resolve("trainings")).size());
        launch();
        assertEquals(3, Files.readAllLines(dir.resolve("trainings")).size(), "a fresh archive is not remade");

        Files.setLastModifiedTime(archive, java.nio.file.attribute.FileTime.fromMillis(
                Files.getLastModifiedTime(jar).toMillis() - 5000));
        String[] again = launch();
        assertEquals(4, Files.readAllLines(dir.resolve("trainings")).size(), "an archive older than the jar is remade");
        assertTrue(again[1].contains("SharedArchiveFile"), again[1]);
    }

    /**
     * The quick compiler alone (-XX:TieredStopAtLevel=1) for a fit or check of model files under
     * 1 MB; both compilers for other commands, random starts, a bigger file or standard input.
     */
    @Test
    void shortRunsUseTheQuickCompilerOnly() throws Exception {
        Path launcher = Path.of("..", "plumb");
        assumeTrue(Files.isRegularFile(launcher), "run from the cli module");
        Files.copy(launcher, dir.resolve("plumb"));
        Files.writeString(dir.resolve("pom.xml"), "<project/>");
        Files.createDirectories(dir.resolve("bin"));
        Files.createDirectories(dir.resolve("cli/target"));
        script(dir.resolve("bin/mvn"), "exit 0\n");
        Files.writeString(dir.resolve("cli/target/plumb.jar"), "jar");
        script(dir.resolve("bin/java"), "echo \"java $*\"\n");
        Files.writeString(dir.resolve("small.json"), "{}");
        try (var f = new java.io.RandomAccessFile(dir.resolve("big.json").toFile(), "rw")) {
            f.setLength(2_000_000);
        }
        String quick = "-XX:TieredStopAtLevel=1";
        assertTrue(launch("fit", "small.json")[1].contains(quick + " -jar"));
        assertTrue(launch("check", "--strict", "small.json")[1].contains(quick));
        assertTrue(launch("fit", "--intervals", "mu", "--json", "out.json", "small.json")[1].contains(quick));
        for (String[] args : new String[][] {{"fit", "big.json"}, {"fit", "small.json", "big.json"},
                {"fit", "--starts", "5", "small.json"}, {"fit", "--starts=5", "small.json"}, {"fit", "-"},
                {"fit"}, {"inject", "small.json"}, {"limit", "small.json"}, {"--version"}}) {
            String[] r = launch(args);
            assertEquals("0", r[0], r[2]);
            assertTrue(r[1].startsWith("java ") && !r[1].contains(quick), String.join(" ", args) + ": " + r[1]);
        }
    }
}
