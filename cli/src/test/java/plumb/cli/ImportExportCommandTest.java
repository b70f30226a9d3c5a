package plumb.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static plumb.cli.CommandLineTestSupport.run;

/** {@code plumb export} and {@code plumb import}: the demo model survives the round trip; bad tables exit 2 writing nothing. */
class ImportExportCommandTest {

    @Test
    void theDemoModelWrittenAsATableAndImportedIsTheSameModel(@TempDir Path dir) throws IOException {
        Path demo = CommandLineTestSupport.demoModel(dir);
        Path csv = dir.resolve("demo.csv"), settings = dir.resolve("settings.json"), back = dir.resolve("back.json");
        var r = run("export", demo.toString(), "--csv", csv.toString(), "--settings", settings.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(Files.readString(csv).startsWith("region,sample,variation,side,bin,low,high,content,error\n"));
        r = run("import", csv.toString(), "--settings", settings.toString(), "--out", back.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().startsWith("wrote " + back + " (3 channels, 11 samples, "), r.out());
        assertEquals(ModelWriter.toJson(ModelReader.read(demo)), ModelWriter.toJson(ModelReader.read(back)));
    }

    @Test
    void aRaggedTableExitsTwoNamingLineAndColumn(@TempDir Path dir) throws IOException {
        Path csv = dir.resolve("t.csv"), out = dir.resolve("m.json");
        Files.writeString(csv, """
                region,sample,variation,side,bin,low,high,content,error
                sr,bkg,,nominal,0,0,1,10,
                sr,bkg,,nominal,1,1,2,x,
                """);
        var r = run("import", csv.toString(), "--out", out.toString());
        assertEquals(2, r.status());
        assertEquals("plumb import: " + csv + ": line 3, column content: \"x\" is not a number", r.err().strip());
        assertFalse(Files.exists(out));
        Files.writeString(csv, Files.readString(csv).replace(",x,", ",4,"));
        Path settings = dir.resolve("s.json");
        Files.writeString(settings, "{\"poi\": \"mu\"}");
        r = run("import", csv.toString(), "--settings", settings.toString(), "--out", out.toString());
        assertEquals(2, r.status());
        assertTrue(r.err().strip().endsWith("poi: \"mu\" is not a parameter of the model (in no sample's factors and no variation)"), r.err());
        assertFalse(Files.exists(out));
        r = run("import", csv.toString(), "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        assertEquals("t", ModelReader.read(out).name());
    }
}
