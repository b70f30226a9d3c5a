package plumb.engine.tooling;

import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.TestModels;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ModelWriter;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.StringReader;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Histogram tables to models: the round trip, the JSON reader, and every refusal of a ragged table. */
class HistogramImportTest {

    private static final String TABLE = """
            region,sample,variation,side,bin,low,high,content,error
            sr,@data,,nominal,0,100,110,12,
            sr,@data,,nominal,1,110,120,7,
            sr,bkg,,nominal,0,100,110,10.5,1.5
            sr,bkg,,nominal,1,110,120,6,1
            sr,bkg,jes,up,0,100,110,11,
            sr,bkg,jes,up,1,110,120,6.5,
            sr,bkg,jes,down,0,100,110,10,
            sr,bkg,jes,down,1,110,120,5.5,
            sr,bkg,lumi,kappa_up,,,,1.02,
            sr,bkg,lumi,kappa_down,,,,0.98,
            """;

    private static List<HistogramRow> rows(String csv) throws IOException {
        return CsvHistograms.read(new BufferedReader(new StringReader(csv)), "t.csv");
    }

    private static Model build(String csv) throws IOException {
        return HistogramImport.build(rows(csv), "t.csv", null, null, "imported");
    }

    @Test
    void readsATable() throws IOException {
        Model m = build(TABLE);
        var ch = m.channels().get(0);
        assertEquals("sr", ch.name());
        assertEquals(List.of(100.0, 110.0, 120.0), java.util.Arrays.stream(ch.edges()).boxed().toList());
        assertEquals(12, ch.observed()[0], 0);
        var bkg = ch.samples().get(0);
        assertEquals(1.5, bkg.mcError()[0], 0);
        assertEquals("jes", bkg.variations().get(0).parameter());
        assertEquals(6.5, bkg.variations().get(0).shape().up()[1], 0);
        assertNull(bkg.variations().get(0).norm());
        assertEquals(1.02, bkg.variations().get(1).norm().up(), 0);
    }

    /** A model written as table plus settings and read back is the same model, to the last bit. */
    @ParameterizedTest
    @CsvSource({"1,GAUSSIAN", "2,POISSON"})
    void roundTrip(long seed, ModelOptions.McStatConstraint mc) throws IOException {
        Model original = TestModels.mixed(seed, mc);
        StringWriter csv = new StringWriter();
        CsvHistograms.write(original, csv);
        var settings = new ObjectMapper().readTree(ModelSettings.of(original));
        Model back = HistogramImport.build(rows(csv.toString()), "t.csv", settings, "s.json", "x");
        assertEquals(ModelWriter.toJson(original), ModelWriter.toJson(back));
    }

    @Test
    void theJsonReaderGivesTheSameModel(@TempDir Path dir) throws IOException {
        Path file = dir.resolve("h.json");
        Files.writeString(file, """
                {"format": "plumb-histograms/1", "regions": [{"name": "sr", "edges": [100, 110, 120], "data": [12, 7],
                  "samples": [{"name": "bkg", "content": [10.5, 6], "error": [1.5, 1],
                    "variations": [{"parameter": "jes", "up": [11, 6.5], "down": [10, 5.5]},
                                   {"parameter": "lumi", "kappaUp": 1.02, "kappaDown": 0.98}]}]}]}
                """);
        Model m = HistogramImport.build(JsonHistograms.read(file), file.toString(), null, null, "imported");
        assertEquals(ModelWriter.toJson(build(TABLE)), ModelWriter.toJson(m));
        Files.writeString(file, Files.readString(file).replace("[11, 6.5]", "[11, \"6.5\"]"));
        ModelException e = assertThrows(ModelException.class, () -> JsonHistograms.read(file));
        assertTrue(e.getMessage().endsWith("h.json: regions[0].samples[0].variations[0].up[1]: expected a number"), e.getMessage());
        Files.writeString(file, Files.readString(file).replace("\"6.5\"]", "6.5, 3]"));
        e = assertThrows(ModelException.class, () -> JsonHistograms.read(file));
        assertTrue(e.getMessage().endsWith("regions[0].samples[0].variations[0].up: 3 values, the region's edges make 2 bins"), e.getMessage());
    }

    /** Each refusal names the file, the line and the column: {what, line replaced, replacement, message}. */
    private static final String[][] RAGGED = {
            {"missing bin", "sr,bkg,jes,down,1,110,120,5.5,", "",
                    "t.csv: line 8, column bin: sr/bkg/jes down has no row for bin 1 (region sr has bins 0..1)"},
            {"edges disagree", "sr,bkg,jes,down,1,110,120,5.5,", "sr,bkg,jes,down,1,110,121,5.5,",
                    "t.csv: line 9, column high: bin 1 of region sr has edges [110.0, 120.0] on an earlier row, here [110.0, 121.0]"},
            {"duplicate row", "sr,bkg,,nominal,1,110,120,6,1", "sr,bkg,,nominal,1,110,120,6,1\nsr,bkg,,nominal,1,110,120,6,1",
                    "t.csv: line 6, column bin: duplicate row: sr/bkg nominal bin 1 given twice"},
            {"side without partner", "sr,bkg,lumi,kappa_down,,,,0.98,", "",
                    "t.csv: line 10, column side: sr/bkg/lumi has kappa_up rows but no kappa_down rows"},
            {"not a number", "sr,bkg,,nominal,1,110,120,6,1", "sr,bkg,,nominal,1,110,120,six,1",
                    "t.csv: line 5, column content: \"six\" is not a number"},
            {"error on some bins", "sr,bkg,,nominal,1,110,120,6,1", "sr,bkg,,nominal,1,110,120,6,",
                    "t.csv: line 5, column error: empty while other bins of sr/bkg give an error: give all or none"},
            {"unknown side", "sr,bkg,jes,down,0,100,110,10,", "sr,bkg,jes,sideways,0,100,110,10,",
                    "t.csv: line 8, column side: \"sideways\", expected nominal, up, down, kappa_up or kappa_down"},
            {"short row", "sr,bkg,jes,down,0,100,110,10,", "sr,bkg,jes,down,0,100,110,10",
                    "t.csv: line 8: 8 cells, expected 9 like the header"},
            {"negative yield", "sr,bkg,,nominal,1,110,120,6,1", "sr,bkg,,nominal,1,110,120,-6,1",
                    "t.csv: channels[0].samples[0].yields[1]: -6.0, must be >= 0"},
    };

    @Test
    void raggedTablesAreRefused() {
        for (String[] c : RAGGED) {
            String replacement = c[2].replace("\\n", "\n");
            String csv = TABLE.replace(c[1] + "\n", replacement.isEmpty() ? "" : replacement + "\n");
            assertTrue(!csv.equals(TABLE), c[0]);
            ModelException e = assertThrows(ModelException.class, () -> build(csv), c[0]);
            assertEquals(c[3], e.getMessage(), c[0]);
        }
    }
}
