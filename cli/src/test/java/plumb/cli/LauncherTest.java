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
        ProcessBuilder pb = new ProcessBuilder("bash", dir.resolve("plumb").toString(), "--version");
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
}
