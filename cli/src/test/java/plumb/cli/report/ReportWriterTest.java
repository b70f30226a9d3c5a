package plumb.cli.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ReportWriterTest {

    private static final Pattern REFERENCE = Pattern.compile("(?:src|href)=\"([^\"]*)\"");

    @TempDir
    Path tmp;

    @Test
    void everyImageAndLinkResolvesToAFileInTheReport() throws IOException {
        Path dir = tmp.resolve("out");
        Path index = ReportWriter.write(ReportFixtures.full(), dir);
        assertEquals(dir.resolve("index.html"), index);
        String html = Files.readString(index, StandardCharsets.UTF_8);

        List<String> refs = references(html);
        int images = 0;
        for (String ref : refs) {
            if (ref.startsWith("#")) {
                assertTrue(html.contains("id=\"" + ref.substring(1) + "\""), "anchor " + ref);
                continue;
            }
            assertFalse(ref.contains(":"), "absolute or external reference " + ref);
            Path file = dir.resolve(ref).normalize();
            assertTrue(file.startsWith(dir), "reference leaves the report: " + ref);
            assertTrue(Files.isRegularFile(file), "missing " + ref);
            if (ref.endsWith(".png")) {
                assertTrue(ImageIO.read(file.toFile()).getWidth() >= 600, ref);
                images++;
            }
        }
        // 3 yields (two channels, one blinded without post-fit) + correlation, pulls, impacts, scan, limits, injection.
        assertEquals(9, count(html, "<img "));
        assertTrue(images >= 9);
        for (String section : List.of("summary", "fit", "pulls", "impacts", "yields", "scan", "discovery", "limits",
                "gof", "injection", "files")) {
            assertTrue(html.contains("<section id=\"" + section + "\">"), section);
        }
    }

    @Test
    void pageIsSelfContained() throws IOException {
        String html = Files.readString(ReportWriter.write(ReportFixtures.full(), tmp.resolve("r")), StandardCharsets.UTF_8);
        assertFalse(html.contains("http://") || html.contains("https://") || html.contains("//cdn"), "network reference");
        assertFalse(Pattern.compile("<script[^>]+src=").matcher(html).find(), "external script");
        assertFalse(html.contains("<link"), "external stylesheet");
        assertTrue(html.contains("<style>"));
    }

    @Test
    void userTextIsEscaped() throws IOException {
        String html = Files.readString(ReportWriter.write(ReportFixtures.full(), tmp.resolve("r")), StandardCharsets.UTF_8);
        assertFalse(html.contains("<script>alert"), "model name injected markup");
        assertTrue(html.contains("gg_res &lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &quot;friends&quot;"));
        // Exactly one script element: our own load check.
        assertEquals(1, count(html, "<script>"));
    }

    @Test
    void summaryShowsHashSeedWarningsAndNonConvergedFitsInRed() throws IOException {
        String html = Files.readString(ReportWriter.write(ReportFixtures.full(), tmp.resolve("r")), StandardCharsets.UTF_8);
        String summary = html.substring(html.indexOf("<section id=\"summary\">"), html.indexOf("<section id=\"fit\">"));
        assertTrue(summary.contains("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"));
        assertTrue(summary.contains("<dd>20240611</dd>"));
        assertTrue(summary.contains("<dd>1 min 23 s</dd>"));
        assertTrue(summary.contains("<div class=\"bad box\"><strong>Fits that did not converge (1)</strong><ul><li>scan point mu_res=2.9</li>"));
        assertTrue(summary.contains("one-sided in channel ctrl_highpt"));
        assertTrue(html.indexOf("<section id=\"summary\">") < html.indexOf("<section id=\"fit\">"), "summary first");
    }

    @Test
    void tablesAreWrittenInEveryFormat() throws IOException {
        Path dir = tmp.resolve("r");
        ReportWriter.write(ReportFixtures.full(), dir);
        String csv = Files.readString(dir.resolve("tables/fit_parameters.csv"), StandardCharsets.UTF_8);
        assertTrue(csv.startsWith("Parameter,Fitted,Pre-fit,Pull,Constraint\r\nmu_res,1.08 ± 0.27,1.000 (free),–,–\r\n"), csv);
        String tex = Files.readString(dir.resolve("tables/fit_parameters.tex"), StandardCharsets.UTF_8);
        assertTrue(tex.contains("photon\\_energy\\_scale & 0.42 $\\pm$ 0.71"), tex);
        String md = Files.readString(dir.resolve("tables/yields_sr_diphoton_postfit.md"), StandardCharsets.UTF_8);
        assertTrue(md.startsWith("**Post-fit yields, sr_diphoton**\n\n| Bin | resonance | continuum γγ | γ + jet fakes | Total | Observed |\n"), md);
        assertEquals("{\"converged\": true}", Files.readString(dir.resolve("json/fit.json")));
    }

    @Test
    void aSecondReportReplacesTheFirstWhole() throws IOException {
        Path dir = tmp.resolve("r");
        ReportWriter.write(ReportFixtures.full(), dir);
        assertTrue(Files.isDirectory(dir.resolve("figures")));
        assertTrue(Files.exists(dir.resolve(ReportFolder.MARKER)), "a report marks its folder");
        ReportWriter.write(ReportInput.of(ReportFixtures.full().summary()), dir);
        // the second report draws no figure: nothing of the first one may be left beside it
        assertFalse(Files.exists(dir.resolve("figures")), "the first report's figures are gone");
        assertFalse(Files.exists(dir.resolve("tables/fit_parameters.csv")), "the first report's tables are gone");
        assertTrue(Files.exists(dir.resolve(ReportFolder.MARKER)));
        String html = Files.readString(dir.resolve("index.html"));
        assertTrue(html.contains("Not run for this report."));
        assertFalse(html.contains("<img "));
        assertNoStagingLeft();
    }

    @Test
    void aFolderHoldingOtherFilesIsRefusedAndLeftAlone() throws IOException {
        Path dir = Files.createDirectories(tmp.resolve("r"));
        Files.writeString(dir.resolve("notes.txt"), "mine");
        ReportFolder.NotReusable e = assertThrows(ReportFolder.NotReusable.class, () -> ReportWriter.write(ReportFixtures.full(), dir));
        assertTrue(e.getMessage().contains("notes.txt"), e.getMessage());
        assertEquals(1, e.getMessage().lines().count());
        assertEquals("mine", Files.readString(dir.resolve("notes.txt")));
        try (Stream<Path> left = Files.list(dir)) {
            assertEquals(List.of(dir.resolve("notes.txt")), left.toList(), "nothing written into the folder");
        }
        assertNoStagingLeft();
    }

    @Test
    void anEmptyFolderOrOneHoldingOnlyTheInputModelTakesTheReportAndKeepsTheModel() throws IOException {
        Path empty = Files.createDirectories(tmp.resolve("empty"));
        ReportWriter.write(ReportFixtures.full(), empty);
        assertTrue(Files.exists(empty.resolve("index.html")));
        Path dir = Files.createDirectories(tmp.resolve("r"));
        Path model = Files.writeString(dir.resolve("model.json"), "{\"the\": \"model\"}");
        ReportWriter.write(ReportFixtures.full(), dir, List.of(model));
        ReportWriter.write(ReportInput.of(ReportFixtures.full().summary()), dir, List.of(model));
        assertEquals("{\"the\": \"model\"}", Files.readString(model), "the input model is kept through both reports");
        assertFalse(Files.exists(dir.resolve("figures")));
        assertNoStagingLeft();
    }

    @Test
    void aLinkToAReportFolderIsKeptAndItsFolderReplaced() throws IOException {
        Path real = tmp.resolve("real");
        ReportWriter.write(ReportFixtures.full(), real);
        Path link = Files.createSymbolicLink(tmp.resolve("link"), real);
        ReportWriter.write(ReportInput.of(ReportFixtures.full().summary()), link);
        assertTrue(Files.isSymbolicLink(link));
        assertFalse(Files.exists(real.resolve("figures")));
        assertTrue(Files.readString(link.resolve("index.html")).contains("Not run for this report."));
        assertNoStagingLeft();
    }

    @Test
    void aFailureLeavesTheTargetUntouched() throws IOException {
        Path file = tmp.resolve("taken");
        Files.writeString(file, "not a directory");
        assertThrows(IOException.class, () -> ReportWriter.write(ReportFixtures.full(), file));
        assertEquals("not a directory", Files.readString(file));
        assertNoStagingLeft();
    }

    @Test
    void sha256OfAFile() throws IOException {
        // FIPS 180-2, appendix B.1: SHA-256("abc").
        Path f = tmp.resolve("abc.json");
        Files.writeString(f, "abc");
        assertEquals("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", RunSummary.sha256(f));
    }

    @Test
    void durations() {
        assertEquals("0.84 s", ReportWriter.duration(0.8412));
        assertEquals("12.3 s", ReportWriter.duration(12.34));
        assertEquals("2 min 05 s", ReportWriter.duration(125.2));
        assertEquals("1 h 02 min", ReportWriter.duration(3725));
        assertEquals("–", ReportWriter.duration(Double.NaN));
    }

    @Test
    void attachmentsMustStayInsideTheReport() {
        for (String bad : List.of("../x.json", "/etc/passwd", "index.html", "a\\b")) {
            assertThrows(IllegalArgumentException.class, () -> new Results.Attachment(bad, "x", new byte[0]), bad);
        }
    }

    private void assertNoStagingLeft() throws IOException {
        try (Stream<Path> s = Files.list(tmp)) {
            assertEquals(List.of(), s.filter(p -> p.getFileName().toString().contains(".tmp-")).toList());
        }
    }

    static List<String> references(String html) {
        List<String> out = new ArrayList<>();
        Matcher m = REFERENCE.matcher(html);
        while (m.find()) out.add(m.group(1));
        return out;
    }

    private static int count(String s, String what) {
        int n = 0;
        for (int i = s.indexOf(what); i >= 0; i = s.indexOf(what, i + 1)) n++;
        return n;
    }

    @Test
    void staleStagingFoldersAreSweptAndTheNewFolderFollowsTheUmask(@TempDir Path tmp) throws IOException {
        Path stale = Files.createDirectories(tmp.resolve("r.tmp-killed/figures"));
        Files.writeString(stale.resolve("a.png"), "left by a killed run");
        Path other = Files.createDirectories(tmp.resolve("other.tmp-keep"));
        ReportWriter.write(ReportFixtures.full(), tmp.resolve("r"));
        assertFalse(Files.exists(tmp.resolve("r.tmp-killed")), "stale staging folder of the same target swept");
        assertTrue(Files.exists(other), "another target's folder is left alone");
        try (var left = Files.list(tmp)) {
            assertEquals(0, left.filter(p -> p.getFileName().toString().startsWith("r.tmp-")).count());
        }
        // a new folder made the ordinary way shows what the umask allows; the report folder matches it
        Path probe = Files.createDirectory(tmp.resolve("probe"));
        assertEquals(java.nio.file.Files.getPosixFilePermissions(probe), java.nio.file.Files.getPosixFilePermissions(tmp.resolve("r")));
    }
}
