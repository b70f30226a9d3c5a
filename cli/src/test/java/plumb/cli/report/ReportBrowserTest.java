package plumb.cli.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Opens a generated report in headless Chromium ({@link HeadlessChromium}). Skipped only when
 * chromium is not installed.
 */
class ReportBrowserTest {

    @TempDir
    Path tmp;

    @Test
    void reportLoadsInABrowserWithoutErrors() throws Exception {
        Assumptions.assumeTrue(HeadlessChromium.available(), "chromium is not installed");
        Path index = ReportWriter.write(ReportFixtures.full(), tmp.resolve("report"));
        int images = Files.readString(index).split("<img ", -1).length - 1;
        assertEquals(9, images);

        HeadlessChromium.Page page = HeadlessChromium.open(index, tmp);
        String attributes = page.bodyAttributes();
        assertTrue(attributes.contains("data-check=\"ok\""), "page check failed: " + attributes);
        assertTrue(attributes.contains("data-images=\"" + images + "\""), attributes);
        assertEquals(List.of(), page.consoleLines(), "console messages");
    }

    @Test
    void theCheckCatchesAMissingFigure() throws Exception {
        Assumptions.assumeTrue(HeadlessChromium.available(), "chromium is not installed");
        Path index = ReportWriter.write(ReportFixtures.full(), tmp.resolve("report"));
        Files.delete(index.resolveSibling("figures/scan.png"));
        HeadlessChromium.Page page = HeadlessChromium.open(index, tmp);
        assertTrue(page.dom().contains("data-check=\"failed\""), "a deleted figure went unnoticed");
        assertTrue(page.dom().contains("data-broken=\"figures/scan.png\""), page.dom().substring(0, Math.min(600, page.dom().length())));
    }
}
