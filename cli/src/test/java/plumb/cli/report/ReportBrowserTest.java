package plumb.cli.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Opens a generated report in headless Chromium. The page's own load check sets
 * {@code data-check} on {@code <body>} after every image has loaded (or failed) and records
 * script errors; {@code --dump-dom} prints the DOM after the load event. Console messages are
 * logged to stderr with {@code --enable-logging=stderr}, and the page writes none, so any
 * "CONSOLE" line is a failure. Skipped only when chromium is not installed.
 */
class ReportBrowserTest {

    private static final Path CHROMIUM = Path.of("/usr/bin/chromium");

    @TempDir
    Path tmp;

    @Test
    void reportLoadsInABrowserWithoutErrors() throws Exception {
        Assumptions.assumeTrue(Files.isExecutable(CHROMIUM), "chromium is not installed");
        Path index = ReportWriter.write(ReportFixtures.full(), tmp.resolve("report"));
        int images = Files.readString(index).split("<img ", -1).length - 1;
        assertEquals(9, images);

        Result r = dumpDom(index);
        Matcher body = Pattern.compile("<body([^>]*)>").matcher(r.dom);
        assertTrue(body.find(), "no <body> in the dumped DOM; stderr: " + r.stderr);
        String attributes = body.group(1);
        assertTrue(attributes.contains("data-check=\"ok\""), "page check failed: " + attributes);
        assertTrue(attributes.contains("data-images=\"" + images + "\""), attributes);
        assertEquals(List.of(), consoleLines(r.stderr), "console messages");
    }

    @Test
    void theCheckCatchesAMissingFigure() throws Exception {
        Assumptions.assumeTrue(Files.isExecutable(CHROMIUM), "chromium is not installed");
        Path index = ReportWriter.write(ReportFixtures.full(), tmp.resolve("report"));
        Files.delete(index.resolveSibling("figures/scan.png"));
        Result r = dumpDom(index);
        assertTrue(r.dom.contains("data-check=\"failed\""), "a deleted figure went unnoticed");
        assertTrue(r.dom.contains("data-broken=\"figures/scan.png\""), r.dom.substring(0, Math.min(600, r.dom.length())));
    }

    private record Result(String dom, String stderr) {
    }

    private Result dumpDom(Path index) throws IOException, InterruptedException {
        Path profile = Files.createTempDirectory(tmp, "profile");
        Path out = tmp.resolve("dom.html");
        Path err = tmp.resolve("stderr.txt");
        List<String> cmd = new ArrayList<>(List.of(CHROMIUM.toString(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--user-data-dir=" + profile, "--enable-logging=stderr", "--v=0",
                "--virtual-time-budget=10000", "--dump-dom", index.toUri().toString()));
        Process p = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("chromium did not finish within 120 s");
        }
        return new Result(Files.readString(out, StandardCharsets.UTF_8), Files.readString(err, StandardCharsets.UTF_8));
    }

    private static List<String> consoleLines(String stderr) {
        List<String> lines = new ArrayList<>();
        for (String line : stderr.split("\n")) if (line.contains(":CONSOLE")) lines.add(line);
        return lines;
    }
}
