package plumb.cli.report;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.CommandLineTestSupport;
import plumb.cli.build.CutFlowFileTest;
import plumb.cli.build.CutFlowRow;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The report's cut-flow section: one table per region, and no section (nor link) without a cut flow. */
class CutFlowSectionTest {

    @TempDir
    Path dir;

    @Test
    void theReportShowsOneTablePerRegionOnlyWhenThereIsACutFlow() throws IOException {
        Model m = ModelReader.read(CommandLineTestSupport.demoModel(dir));
        List<CutFlowRow> rows = new ArrayList<>(CutFlowFileTest.matching(m));
        String region = m.channels().get(0).name();
        rows.add(new CutFlowRow(region, "data", "two photons, \"tight\"", 50, 50));
        rows.add(new CutFlowRow(region, "data", CutFlowRow.IN_THE_BINS, 20, 20));
        Path page = ReportWriter.write(ReportInput.of(ReportFixtures.full().summary()).withCutFlow(rows), dir.resolve("with"));
        String html = Files.readString(page);
        assertTrue(html.contains("<section id=\"cutflow\">") && html.contains("href=\"#cutflow\""));
        for (Channel c : m.channels()) assertTrue(html.contains("Region " + c.name() + ": events left after each step"), c.name());
        assertTrue(html.contains("two photons, &quot;tight&quot;") || html.contains("two photons, \"tight\""));
        // the data's weight is one: one column of counts, no Σw column
        assertTrue(html.contains(">data events<") && !html.contains(">data Σw<"));
        List<String> csv = Files.readAllLines(dir.resolve("with/tables/cutflow_" + region + ".csv"));
        assertEquals(3, csv.size());   // header, the step, in the bins
        assertTrue(csv.get(2).startsWith("in the bins,") && csv.get(2).endsWith(",20"), csv.get(2));

        String without = Files.readString(ReportWriter.write(ReportInput.of(ReportFixtures.full().summary()), dir.resolve("without")));
        assertFalse(without.contains("id=\"cutflow\"") || without.contains("#cutflow"));
    }
}
