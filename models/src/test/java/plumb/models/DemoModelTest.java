package plumb.models;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import plumb.engine.api.FitOutcome;
import plumb.engine.api.Plumb;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

class DemoModelTest {

    private static String storedText() throws IOException {
        try (InputStream in = DemoModel.openStream()) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
    }

    @Test
    void buildReproducesTheStoredFileByteForByte() throws IOException {
        // If this fails after a deliberate change of the recipe, regenerate the resource with
        // DemoModel.main (see its Javadoc) and commit it.
        assertEquals(storedText(), ModelWriter.toJson(DemoModel.build()));
    }

    @Test
    void storedSignalIsTheGaussianPeakOfTheScenario() throws IOException {
        // Not from the code's output: the scenario's signal is a Gaussian of 38 events at 640 GeV
        // with a 7.7 GeV resolution; each stored bin must hold 38·(Φ(hi) − Φ(lo)), Φ from
        // commons-math, to the six significant digits the file keeps (tails below 1e-4 are 0).
        // The file is read as plain JSON, not through the engine's reader.
        JsonNode sr = new ObjectMapper().readTree(storedText()).get("channels").get(0);
        assertEquals("sr_tight", sr.get("name").asText());
        JsonNode signal = sr.get("samples").get(0);
        assertEquals("signal", signal.get("name").asText());
        NormalDistribution peak = new NormalDistribution(640, 7.7);
        JsonNode edges = sr.get("edges"), yields = signal.get("yields");
        double total = 0;
        for (int b = 0; b < yields.size(); b++) {
            double expected = 38 * (peak.cumulativeProbability(edges.get(b + 1).asDouble())
                    - peak.cumulativeProbability(edges.get(b).asDouble()));
            double stored = yields.get(b).asDouble();
            assertEquals(expected, stored, Math.max(1e-4, 5e-6 * expected), "bin " + b);
            total += stored;
        }
        assertEquals(38, total, 1e-3);   // the peak lies far inside 500-800 GeV
    }

    @Test
    void anAsimovFitOfTheDemoReturnsItsGeneratingSignalStrength() {
        // The fit of an Asimov data set returns the values it was generated from (Cowan, Cranmer,
        // Gross, Vitells, Eur. Phys. J. C 71 (2011) 1554, section 3.1): mu = 1, whatever the code.
        CompiledModel m = ModelCompiler.compile(DemoModel.load());
        FitOutcome fit = Plumb.fit(Plumb.asimov(m, 1.0));
        assertTrue(fit.converged(), fit.status());
        assertEquals(1.0, fit.value("mu"), 1e-4);
        FitOutcome atTwo = Plumb.fit(Plumb.asimov(m, 2.0));
        assertEquals(2.0, atTwo.value("mu"), 1e-4);
    }

    @Test
    void loadReadsTheStoredFileThroughTheClassPath() throws IOException {
        assertEquals("plumb/models/demo.json", DemoModel.resourcePath());
        Model loaded = DemoModel.load();
        ModelJsonAssert.assertSameContent(loaded, new ObjectMapper().readTree(storedText()));
        assertEquals(storedText(), ModelWriter.toJson(loaded));
    }

    @Test
    void hasTheThreeRegionsWithATwentyBinSignalRegion() {
        Model m = DemoModel.build();
        assertEquals(List.of("sr_tight", "cr_loose_isolation", "cr_low_mass"),
                m.channels().stream().map(Channel::name).toList());
        Channel sr = m.channels().get(0);
        assertEquals(20, sr.bins());
        assertEquals(500.0, sr.edges()[0]);
        assertEquals(800.0, sr.edges()[20]);
        for (Channel ch : m.channels()) assertEquals("m(γγ) [GeV]", ch.observable());
        assertEquals(List.of("signal", "prompt_diphoton", "photon_jet_fakes", "dijet_fakes"),
                sr.samples().stream().map(Sample::name).toList());
        assertEquals("mu", m.poi());
        assertEquals(640.0, m.labels().get("mass"));
    }

    @Test
    void backgroundsFloatWithTwoFreeFactorsSeenByEveryRegion() {
        Model m = DemoModel.build();
        Set<String> varied = new HashSet<>();
        for (Channel ch : m.channels()) {
            Set<String> factors = new HashSet<>();
            for (Sample s : ch.samples()) {
                factors.addAll(s.factors());
                for (Variation v : s.variations()) varied.add(v.parameter());
                if (s.name().equals("signal")) {
                    assertEquals(List.of("mu"), s.factors());
                    assertNull(s.mcError());
                } else {
                    assertEquals(s.yields().length, s.mcError().length, ch.name() + "/" + s.name());
                    for (int b = 0; b < s.yields().length; b++) {
                        double rel = s.mcError()[b] / s.yields()[b];
                        assertTrue(rel >= 0.0149 && rel <= 0.1001, ch.name() + "/" + s.name() + " " + rel);
                    }
                }
            }
            assertTrue(factors.containsAll(List.of("k_diphoton", "k_fakes")), ch.name());
        }
        // Free means: no variation (hence no constraint) and no entry in parameters.
        assertTrue(!varied.contains("k_diphoton") && !varied.contains("k_fakes"));
        for (ParameterSpec p : m.parameters()) assertTrue(!p.name().startsWith("k_"), p.name());
        ParameterSpec rDijet = m.parameters().get(1);
        assertEquals("r_dijet", rDijet.name());
        assertEquals(new ParameterSpec.Poisson(0.25), rDijet.constraint());
    }

    @Test
    void nuisanceParametersMixNormShapeAndBothAndAllBelongToAGroup() {
        Model m = DemoModel.build();
        Set<String> nuisances = new HashSet<>();
        Set<String> normOnly = new HashSet<>(), shapeOnly = new HashSet<>(), both = new HashSet<>();
        boolean asymmetric = false, oneSided = false;
        for (Channel ch : m.channels()) {
            for (Sample s : ch.samples()) {
                for (Variation v : s.variations()) {
                    nuisances.add(v.parameter());
                    if (v.norm() != null && v.shape() != null) both.add(v.parameter());
                    else if (v.norm() != null) normOnly.add(v.parameter());
                    else shapeOnly.add(v.parameter());
                    if (v.norm() != null && Math.abs(v.norm().up() * v.norm().down() - 1) > 1e-3) asymmetric = true;
                    if (v.shape() != null) oneSided |= java.util.Arrays.equals(v.shape().down(), s.yields());
                }
            }
        }
        assertEquals(17, nuisances.size(), nuisances.toString());   // a realistic analysis: at least 15
        assertTrue(normOnly.size() >= 3 && shapeOnly.size() >= 3 && both.size() >= 2,
                normOnly + " " + shapeOnly + " " + both);
        assertTrue(asymmetric && oneSided);
        assertEquals(List.of("photon", "detector", "luminosity", "background_modelling", "theory"),
                List.copyOf(m.groups().keySet()));
        Set<String> grouped = new HashSet<>();
        m.groups().values().forEach(grouped::addAll);
        Set<String> expected = new HashSet<>(nuisances);
        expected.add("r_dijet");
        assertEquals(expected, grouped);
    }

    @Test
    void observedCountsShowAModestExcessAtTheMass() {
        // Poisson ln L of the signal-region counts with the backgrounds at nominal, scanned in mu;
        // Z = sqrt(2 ΔlnL) = sqrt(q0) for one parameter (Wilks' theorem; common practice).
        Channel sr = DemoModel.build().channels().get(0);
        double[] s = sr.samples().get(0).yields();
        double[] b = new double[s.length];
        for (int k = 1; k < sr.samples().size(); k++) {
            for (int i = 0; i < b.length; i++) b[i] += sr.samples().get(k).yields()[i];
        }
        double best = Double.NEGATIVE_INFINITY, muHat = 0;
        for (int step = 0; step <= 4000; step++) {   // mu in [0, 4] by 0.001
            double mu = step * 0.001;
            double l = lnL(sr.observed(), s, b, mu);
            if (l > best) {
                best = l;
                muHat = mu;
            }
        }
        double z = Math.sqrt(2 * (best - lnL(sr.observed(), s, b, 0)));
        assertTrue(z > 2 && z < 3, "Z = " + z);
        assertTrue(muHat > 0.6 && muHat < 1.4, "mu-hat = " + muHat);
        // Every region's total count agrees with its expectation at mu = 1 within 4 sigma (Poisson).
        for (Channel ch : DemoModel.build().channels()) {
            double n = 0, nu = 0;
            for (double x : ch.observed()) n += x;
            for (Sample smp : ch.samples()) for (double y : smp.yields()) nu += y;
            assertTrue(Math.abs(n - nu) < 4 * Math.sqrt(nu), ch.name() + ": " + n + " vs " + nu);
        }
    }

    private static double lnL(double[] n, double[] s, double[] b, double mu) {
        double l = 0;
        for (int i = 0; i < n.length; i++) {
            double nu = b[i] + mu * s[i];
            l += n[i] * Math.log(nu) - nu;
        }
        return l;
    }

    @Test
    void buildIsDeterministic() {
        Model a = DemoModel.build();
        Model b = DemoModel.build();
        for (int c = 0; c < a.channels().size(); c++) {
            assertArrayEquals(a.channels().get(c).observed(), b.channels().get(c).observed());
        }
        assertEquals(ModelWriter.toJson(a), ModelWriter.toJson(b));
    }
}
