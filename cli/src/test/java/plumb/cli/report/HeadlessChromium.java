package plumb.cli.report;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Opens a report page in headless Chromium and returns the DOM after the load event. The page's
 * own load check sets {@code data-check} on {@code <body>} once every image has loaded (or
 * failed) and records script errors; console messages go to stderr with
 * {@code --enable-logging=stderr}, and the page writes none, so any "CONSOLE" line is a failure.
 */
public final class HeadlessChromium {

    /** The Debian package's binary; tests skip when it is missing. */
    public static final Path BINARY = Path.of("/usr/bin/chromium");

    private HeadlessChromium() {
    }

    /** True when chromium is installed. */
    public static boolean available() {
        return Files.isExecutable(BINARY);
    }

    /** The DOM after loading, and what chromium wrote on standard error. */
    public record Page(String dom, String stderr) {

        /** The attributes of {@code <body>} (where the page's check writes its result). */
        public String bodyAttributes() {
            Matcher body = Pattern.compile("<body([^>]*)>").matcher(dom);
            if (!body.find()) throw new AssertionError("no <body> in the dumped DOM; stderr: " + stderr);
            return body.group(1);
        }

        /** Console messages the page produced. */
        public List<String> consoleLines() {
            List<String> lines = new ArrayList<>();
            for (String line : stderr.split("\n")) if (line.contains(":CONSOLE")) lines.add(line);
            return lines;
        }
    }

    /** Loads {@code index} in a fresh profile under {@code tmp}. */
    public static Page open(Path index, Path tmp) throws IOException, InterruptedException {
        Path profile = Files.createTempDirectory(tmp, "profile");
        Path out = Files.createTempFile(tmp, "dom", ".html");
        Path err = Files.createTempFile(tmp, "stderr", ".txt");
        List<String> cmd = new ArrayList<>(List.of(BINARY.toString(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--user-data-dir=" + profile, "--enable-logging=stderr", "--v=0",
                "--virtual-time-budget=10000", "--dump-dom", index.toUri().toString()));
        Process p = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("chromium did not finish within 120 s");
        }
        return new Page(Files.readString(out, StandardCharsets.UTF_8), Files.readString(err, StandardCharsets.UTF_8));
    }
}
