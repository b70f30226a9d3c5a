package plumb.engine.api;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.DataSet;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The example of docs/library.md: the page shows exactly this source, and it runs. */
class LibraryExampleTest {

    static Path resonance() {
        try {
            return Path.of(LibraryExampleTest.class.getResource("resonance.json").toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void thePageShowsTheTestedSource() throws Exception {
        String page = Files.readString(Path.of("..", "docs", "library.md"));
        String source = Files.readString(Path.of("src", "test", "java", "plumb", "engine", "api", "LibraryExample.java"));
        Matcher block = Pattern.compile("```java\n(.*?)```", Pattern.DOTALL).matcher(page);
        assertTrue(block.find(), "docs/library.md has a java block");
        assertEquals(source, block.group(1));
    }

    @Test
    void theExampleRunsAndItsFitIsTheEngines() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        LibraryExample.run(resonance(), new PrintStream(bytes, true, StandardCharsets.UTF_8));
        String out = bytes.toString(StandardCharsets.UTF_8);
        for (String line : new String[] {"fit: CONVERGED", "impact of slope", "impact of photonScale", "peak: observed 839",
                "scan: 68% interval", "limit: mu <", "discovery: Z =", "gof:", "injection of mu = 2"}) {
            assertTrue(out.contains(line), () -> "missing '" + line + "' in\n" + out);
        }
        // The same fit made through the index-based engine: lumi is parameter index found by name.
        CompiledModel m = Plumb.readModel(resonance());
        int lumi = m.indexOf("lumi");
        FitResult direct = new Fitter(m, DataSet.observed(m), FitSettings.defaults(), new int[] {lumi},
                new double[] {0.5}).fit();
        Matcher mu = Pattern.compile("mu = (\\S+) \\+- ([0-9.]+)").matcher(out);
        assertTrue(mu.find());
        assertEquals(direct.values()[m.poi()], Double.parseDouble(mu.group(1)), 5e-5);
        assertEquals(direct.errors()[m.poi()], Double.parseDouble(mu.group(2)), 5e-5);
    }
}
