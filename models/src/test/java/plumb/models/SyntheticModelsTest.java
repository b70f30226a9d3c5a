package plumb.models;

import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Stream;
import java.util.zip.GZIPInputStream;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SyntheticModelsTest {

    private static final long SEED = 20261201L;

    @Test
    void sameSeedGivesTheSameFile() {
        assertEquals(ModelWriter.toJson(SyntheticModels.medium(SEED)), ModelWriter.toJson(SyntheticModels.medium(SEED)));
    }

    @Test
    void differentSeedsGiveDifferentModelsAndData() {
        Model a = SyntheticModels.medium(SEED);
        Model b = SyntheticModels.medium(SEED + 1);
        assertNotEquals(ModelWriter.toJson(a), ModelWriter.toJson(b));
        assertFalse(Arrays.equals(a.channels().get(0).observed(), b.channels().get(0).observed()));
        assertFalse(Arrays.equals(a.channels().get(0).samples().get(1).yields(), b.channels().get(0).samples().get(1).yields()));
    }

    @ParameterizedTest
    @CsvSource({"1, 1, 2, 0", "1, 3, 2, 1", "3, 7, 4, 13", "5, 40, 6, 50", "20, 50, 8, 300", "1, 10000, 2, 3"})
    void sizesAreThoseRequested(int channels, int bins, int samples, int nuisances) {
        Model m = SyntheticModels.generate(channels, bins, samples, nuisances, SEED);
        assertEquals(channels, m.channels().size());
        Set<String> channelNames = new HashSet<>();
        Set<String> parameters = new HashSet<>();
        for (Channel ch : m.channels()) {
            assertTrue(channelNames.add(ch.name()), ch.name());
            assertEquals(bins + 1, ch.edges().length);
            // Edges are rounded to six digits: they must stay strictly increasing at the finest binning.
            for (int b = 1; b <= bins; b++) assertTrue(ch.edges()[b] > ch.edges()[b - 1], ch.name() + " edge " + b);
            assertEquals(bins, ch.observed().length);
            assertEquals(samples, ch.samples().size());
            for (Sample s : ch.samples()) {
                assertEquals(bins, s.yields().length);
                assertEquals(bins, s.mcError().length);
                for (Variation v : s.variations()) {
                    parameters.add(v.parameter());
                    if (v.shape() != null) {
                        assertEquals(bins, v.shape().up().length);
                        assertEquals(bins, v.shape().down().length);
                    }
                }
            }
        }
        assertEquals(nuisances, parameters.size(), "distinct nuisance parameters");
        assertEquals("mu", m.poi());
    }

    @Test
    void benchmarkPresetsHaveTheirDocumentedSizes() {
        Model medium = SyntheticModels.medium(SEED);
        assertEquals(5, medium.channels().size());
        assertEquals(40, medium.channels().get(0).bins());
        assertEquals(6, medium.channels().get(0).samples().size());
        Model large = SyntheticModels.large(SEED);
        assertEquals(20, large.channels().size());
        assertEquals(50, large.channels().get(0).bins());
        assertEquals(8, large.channels().get(0).samples().size());
    }

    @Test
    void valuesFollowTheFormatRules() {
        // Rules of docs/model-format.md that a strict reader will enforce.
        for (Channel ch : SyntheticModels.large(SEED).channels()) {
            for (int b = 1; b < ch.edges().length; b++) assertTrue(ch.edges()[b] > ch.edges()[b - 1], ch.name());
            for (double n : ch.observed()) assertTrue(n >= 0 && n == Math.rint(n), ch.name());
            for (Sample s : ch.samples()) {
                String where = ch.name() + "/" + s.name();
                assertAllNonNegative(s.yields(), where);
                for (Variation v : s.variations()) {
                    if (v.norm() != null) assertTrue(v.norm().up() > 0 && v.norm().down() > 0, where);
                    if (v.shape() != null) {
                        assertAllNonNegative(v.shape().up(), where);
                        assertAllNonNegative(v.shape().down(), where);
                    }
                }
            }
        }
    }

    @Test
    void noVariationWhereTheNominalIsEmpty() {
        // The signal peak's far tails round to 0; its shifted and widened variations must not
        // give those bins events on one side (a kink of the clip at θ = 0 in every such bin).
        int empty = 0;
        for (Channel ch : SyntheticModels.generate(6, 200, 4, 60, SEED).channels()) {
            for (Sample s : ch.samples()) {
                for (Variation v : s.variations()) {
                    if (v.shape() == null) continue;
                    for (int b = 0; b < s.yields().length; b++) {
                        if (s.yields()[b] != 0) continue;
                        empty++;
                        assertEquals(0.0, v.shape().up()[b], ch.name() + "/" + s.name() + "/" + v.parameter() + " bin " + b);
                        assertEquals(0.0, v.shape().down()[b], ch.name() + "/" + s.name() + "/" + v.parameter() + " bin " + b);
                    }
                }
            }
        }
        assertTrue(empty > 0, "the model has empty signal tails to check");
    }

    private static void assertAllNonNegative(double[] y, String where) {
        for (double v : y) assertTrue(Double.isFinite(v) && v >= 0, where);
    }

    @Test
    void structureIsThatOfARealisticSearch() {
        Model m = SyntheticModels.medium(SEED);
        int channels = m.channels().size();
        Map<String, Set<String>> channelsOf = new HashMap<>();
        Map<String, Set<String>> samplesOf = new HashMap<>();
        int normOnly = 0, shapeOnly = 0, both = 0, asymmetric = 0, oneSided = 0;
        for (Channel ch : m.channels()) {
            assertEquals(List.of("signal", "bkg1", "bkg2", "bkg3", "bkg4", "bkg5"),
                    ch.samples().stream().map(Sample::name).toList());
            assertEquals(List.of("mu"), ch.samples().get(0).factors());
            assertEquals(List.of("k_bkg1"), ch.samples().get(1).factors());
            assertEquals(List.of("k_bkg2"), ch.samples().get(2).factors());
            assertEquals(List.of(), ch.samples().get(3).factors());
            for (Sample s : ch.samples()) {
                for (Variation v : s.variations()) {
                    channelsOf.computeIfAbsent(v.parameter(), k -> new TreeSet<>()).add(ch.name());
                    samplesOf.computeIfAbsent(v.parameter(), k -> new TreeSet<>()).add(s.name());
                    if (v.norm() != null && v.shape() != null) both++;
                    else if (v.norm() != null) normOnly++;
                    else shapeOnly++;
                    if (v.norm() != null) {
                        double product = v.norm().up() * v.norm().down();
                        if (v.norm().down() == 1.0) oneSided++;
                        else if (Math.abs(product - 1) > 1e-4) asymmetric++;  // beyond six-digit rounding
                    } else if (Arrays.equals(v.shape().down(), s.yields())) {
                        oneSided++;
                    }
                }
            }
        }
        assertTrue(normOnly > 0 && shapeOnly > 0 && both > 0, normOnly + " " + shapeOnly + " " + both);
        assertTrue(asymmetric > 0 && oneSided > 0, asymmetric + " " + oneSided);

        List<String> globals = m.groups().get("global");
        assertEquals(5, globals.size(), "10% of 50 parameters are global");
        for (String g : globals) {
            assertEquals(channels, channelsOf.get(g).size(), g + " acts in every channel");
            assertTrue(samplesOf.get(g).size() >= 4, g + " acts on most samples");
        }
        assertEquals(50, channelsOf.size());
        for (String p : channelsOf.keySet()) {
            if (globals.contains(p)) continue;
            int nc = channelsOf.get(p).size();
            int ns = samplesOf.get(p).size();
            assertTrue(nc >= 1 && nc <= 3 && ns >= 1 && ns <= 2, p + ": " + nc + " channels, " + ns + " samples");
        }
        assertTrue(m.labels().get("mass") instanceof Double mass && mass > 100 && mass < 500);
    }

    @Test
    void mcErrorsAreOneToTenPercent() {
        for (Channel ch : SyntheticModels.medium(SEED).channels()) {
            for (Sample s : ch.samples()) {
                for (int b = 0; b < s.yields().length; b++) {
                    if (s.yields()[b] == 0) {
                        assertEquals(0.0, s.mcError()[b]);
                        continue;
                    }
                    double rel = s.mcError()[b] / s.yields()[b];
                    // 1e-5 slack: both numbers are rounded to six significant digits.
                    assertTrue(rel > 0.01 - 1e-5 && rel < 0.10 + 1e-5, ch.name() + "/" + s.name() + "[" + b + "] " + rel);
                }
            }
        }
    }

    @Test
    void observedCountsAreDrawnFromTheModelAtMuOne() {
        // A sum of Poisson counts is Poisson (common practice): the total over every bin of the
        // large model has standard deviation sqrt(expected).
        double expected = 0, observed = 0;
        double[] lnL = new double[3];   // Poisson ln L of the data at mu = 0, 1, 2, nuisances nominal
        for (Channel ch : SyntheticModels.large(SEED).channels()) {
            for (int b = 0; b < ch.bins(); b++) {
                double signal = ch.samples().get(0).yields()[b];
                double background = 0;
                for (int s = 1; s < ch.samples().size(); s++) background += ch.samples().get(s).yields()[b];
                double n = ch.observed()[b];
                observed += n;
                expected += signal + background;
                for (int mu = 0; mu < 3; mu++) {
                    double nu = background + mu * signal;
                    lnL[mu] += n * Math.log(nu) - nu;   // ln n! is the same for every mu
                }
            }
        }
        assertTrue(Math.abs(observed - expected) < 4 * Math.sqrt(expected), observed + " vs " + expected);
        // The data prefer mu = 1 over 0 and 2; by more than 2 units of ln L (about 2 sigma each).
        assertTrue(lnL[1] - lnL[0] > 2 && lnL[1] - lnL[2] > 2, Arrays.toString(lnL));
    }

    @Test
    void writtenFileParsesBackToTheSameContent() throws IOException {
        Model m = SyntheticModels.generate(3, 12, 5, 20, SEED);
        ModelJsonAssert.assertSameContent(m, new ObjectMapper().readTree(ModelWriter.toJson(m)));
    }

    @Test
    void generateFileWritesTheModelPlainOrGzip(@TempDir Path dir) throws IOException {
        String expected = ModelWriter.toJson(SyntheticModels.generate(2, 10, 3, 5, 9L));
        Path plain = dir.resolve("s.json");
        SyntheticModels.generateFile(2, 10, 3, 5, 9L, plain);
        assertEquals(expected, Files.readString(plain, StandardCharsets.UTF_8));
        Path gz = dir.resolve("s.json.gz");
        SyntheticModels.generateFile(2, 10, 3, 5, 9L, gz);
        try (InputStream in = new GZIPInputStream(Files.newInputStream(gz))) {
            assertArrayEquals(expected.getBytes(StandardCharsets.UTF_8), in.readAllBytes());
        }
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
            "0 | 10 | 3 | 5 | --channels must be >= 1, got 0",
            "2 | 0 | 3 | 5 | --bins must be >= 1, got 0",
            "2 | 10 | 1 | 5 | --samples must be >= 2 (the signal and at least one background), got 1",
            "2 | 10 | 3 | -1 | --nuisances must be >= 0, got -1",
            "1001 | 10 | 3 | 5 | --channels must be <= 1000, got 1001",
            "2 | 10001 | 3 | 5 | --bins must be <= 10000, got 10001",
            "1000 | 10000 | 3 | 5 | --channels × --bins × --samples is 30000000, must be <= 10000000"})
    void badSizesAreRefusedNamingTheOptionAndWriteNothing(int c, int b, int s, int k, String message,
                                                          @TempDir Path dir) throws IOException {
        Path out = dir.resolve("never.json");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SyntheticModels.generateFile(c, b, s, k, 1L, out));
        assertEquals(message, e.getMessage());
        try (Stream<Path> files = Files.list(dir)) {
            assertFalse(files.findAny().isPresent());
        }
    }

    @Test
    void missingOutputIsRefusedNamingTheOption() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SyntheticModels.generateFile(1, 1, 2, 0, 1L, null));
        assertEquals("--out is required", e.getMessage());
    }
}
