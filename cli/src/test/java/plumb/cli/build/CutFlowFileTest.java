package plumb.cli.build;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.cli.CommandLineTestSupport;
import plumb.cli.table.TableFormat;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelReader;
import plumb.engine.model.Sample;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The cut flow beside a built model, read back for the report: the file the build writes (through
 * the same table rendering) round-trips, a file that does not hold the model's totals is left out
 * with a warning.
 */
public class CutFlowFileTest {

    @TempDir
    Path dir;

    /** A cut flow that ends at the model's histogram totals: two steps per (channel, sample), with a step name needing quotes. */
    public static List<CutFlowRow> matching(Model m) {
        List<CutFlowRow> rows = new ArrayList<>();
        for (Channel c : m.channels()) {
            for (Sample s : c.samples()) {
                double total = 0;
                for (double y : s.yields()) total += y;
                rows.add(new CutFlowRow(c.name(), s.name(), "two photons, \"tight\"", 1.5 * total + 0.1, 900));
                rows.add(new CutFlowRow(c.name(), s.name(), CutFlowRow.IN_THE_BINS, total, 400));
            }
        }
        return rows;
    }

    private static void writeCsv(Path model, List<CutFlowRow> rows) throws IOException {
        BuildOutcome o = new BuildOutcome(model, rows, List.of(), List.of());
        Files.writeString(Path.of(CutFlowFile.stem(model) + ".csv"), TableFormat.CSV.render(o.cutFlowTable(true)));
    }

    @Test
    void theFileTheBuildWritesIsReadBackExactly() throws IOException {
        Path file = CommandLineTestSupport.demoModel(dir);
        Model m = ModelReader.read(file);
        List<CutFlowRow> rows = matching(m);
        writeCsv(file, rows);
        assertEquals(dir.resolve("demo.cutflow"), CutFlowFile.stem(file));
        assertEquals(dir.resolve("x.cutflow"), CutFlowFile.stem(dir.resolve("x.json.gz")));
        List<String> warnings = new ArrayList<>();
        assertEquals(rows, CutFlowFile.readBeside(file, m, warnings));   // doubles with all digits: equal records
        assertEquals(List.of(), warnings);
    }

    @Test
    void aFileOfAnotherBuildIsLeftOutWithAWarning() throws IOException {
        Path file = CommandLineTestSupport.demoModel(dir);
        Model m = ModelReader.read(file);
        List<String> warnings = new ArrayList<>();
        assertEquals(List.of(), CutFlowFile.readBeside(file, m, warnings));   // no file: nothing, quietly
        assertEquals(List.of(), warnings);

        List<CutFlowRow> rows = new ArrayList<>(matching(m));
        CutFlowRow last = rows.remove(rows.size() - 1);
        rows.add(new CutFlowRow(last.region(), last.sample(), last.step(), last.weighted() * 1.001, last.raw()));
        writeCsv(file, rows);
        assertEquals(List.of(), CutFlowFile.readBeside(file, m, warnings));
        assertEquals(1, warnings.size());
        assertTrue(warnings.get(0).contains("demo.cutflow.csv does not describe this model (" + last.region() + "/" + last.sample()
                + ": the histogram holds"), warnings.get(0));

        Files.writeString(dir.resolve("demo.cutflow.csv"), "region,sample,step,weighted,events\nsr,bkg,\"open,1.0,3\n");
        warnings.clear();
        assertEquals(List.of(), CutFlowFile.readBeside(file, m, warnings));
        assertTrue(warnings.get(0).contains("cannot read the cut flow (a quoted field is not closed"), warnings.toString());
    }
}
