package plumb.cli.report;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.tooling.Templates;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The report's folded templates section: one figure per template, each with its PNG and SVG. */
class TemplatesSectionTest {

    @Test
    void templatesSitInAFoldedSectionWithTheirFiles(@TempDir Path tmp) throws IOException {
        List<Templates.Template> templates = List.of(
                new Templates.Template("sr", "bkg", "jes", "m [GeV]", new double[] {0, 1, 2, 3},
                        new double[] {100, 50, 20}, new double[] {104, 49, 19}, new double[] {95, 52, 21}),
                new Templates.Template("sr", "bkg", "lumi", null, null,
                        new double[] {100, 50, 20}, new double[] {103, 51.5, 20.6}, new double[] {97, 48.5, 19.4}));
        Path index = ReportWriter.write(ReportFixtures.full().withTemplates(templates), tmp.resolve("r"));
        String html = Files.readString(index, StandardCharsets.UTF_8);
        String section = html.substring(html.indexOf("<section id=\"templates\">"), html.indexOf("<section id=\"files\">"));
        assertTrue(section.contains("<details><summary>2 figures"), section);
        assertEquals(2, section.split("<img ", -1).length - 1, section);
        for (String name : List.of("template-000-sr_bkg_jes", "template-001-sr_bkg_lumi")) {
            assertTrue(Files.size(tmp.resolve("r/figures/" + name + ".png")) > 1000, name);
            assertTrue(Files.readString(tmp.resolve("r/figures/" + name + ".svg")).contains("<svg"), name);
            assertTrue(section.contains("figures/" + name + ".svg"), name);
        }
        String without = Files.readString(ReportWriter.write(ReportFixtures.full(), tmp.resolve("q")), StandardCharsets.UTF_8);
        assertTrue(without.contains("Not drawn for this report (plumb report --templates draws them)."));
    }
}
