package plumb.validation.bench;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The benchmark models written to a folder and read back are the generated ones, bit for bit. */
class BenchModelsTest {

    @TempDir
    Path dir;

    @Test
    void modelFilesGiveTheGeneratedLikelihood() throws IOException {
        BenchModels.main(new String[] {dir.toString()});
        for (String size : BenchModels.SIZES) {
            assertTrue(Files.isRegularFile(dir.resolve(size + ".json")), size);
            CompiledModel generated = ModelCompiler.compile(BenchModels.model(size, null));
            CompiledModel read = ModelCompiler.compile(BenchModels.model(size, dir.toString()));
            assertEquals(generated.entries(), read.entries(), size);
            assertEquals(generated.nParams(), read.nParams(), size);
            // −ln L and its gradient away from the nominal point: same numbers to the last bit
            double[] x = Arrays.copyOf(generated.nominal(), generated.nParams());
            for (int i = 0; i < x.length; i++) x[i] += 0.01 * (i % 7 - 3);
            double[] g1 = new double[x.length], g2 = new double[x.length];
            double v1 = new BinnedNll(generated, DataSet.observed(generated)).valueAndGradient(x, g1);
            double v2 = new BinnedNll(read, DataSet.observed(read)).valueAndGradient(x, g2);
            assertEquals(v1, v2, 0.0, size);
            assertTrue(Arrays.equals(g1, g2), size);
        }
    }

    @Test
    void aMissingModelFileIsAnError() {
        assertThrows(RuntimeException.class, () -> BenchModels.model("medium", dir.toString()));
        assertThrows(IllegalArgumentException.class, () -> BenchModels.model("huge", null));
    }
}
