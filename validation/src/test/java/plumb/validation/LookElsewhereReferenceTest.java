package plumb.validation;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.LookElsewhere;
import plumb.engine.inference.Problem;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The look-elsewhere effect against the up-crossings relation of Gross and Vitells. */
class LookElsewhereReferenceTest {

    private static final int BINS = 60;
    private static final double LOW = 100, HIGH = 700;

    /** A falling two-photon mass spectrum with a narrow resonance of width {@code width} at {@code mass}. */
    static Model resonanceAt(double mass, double width, double[] observed) {
        double[] edges = new double[BINS + 1], b = new double[BINS], s = new double[BINS];
        double step = (HIGH - LOW) / BINS;
        for (int i = 0; i <= BINS; i++) edges[i] = LOW + i * step;
        for (int i = 0; i < BINS; i++) {
            double centre = LOW + (i + 0.5) * step;
            b[i] = 2000 * Math.exp(-(centre - LOW) / 250);
            s[i] = 40 * step / (width * Math.sqrt(2 * Math.PI)) * Math.exp(-0.5 * Math.pow((centre - mass) / width, 2));
        }
        Sample sig = new Sample("resonance", s, null, List.of("mu"), List.of());
        Sample bkg = new Sample("continuum", b, null, List.of(), List.of());
        Channel ch = new Channel("diphoton", "m(γγ) [GeV]", edges, observed == null ? b : observed, List.of(sig, bkg));
        return new Model(Model.FORMAT, "scan-" + (int) mass, null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, 50}, null, null, false)), Map.of(),
                Map.of("mass", mass), null);
    }

    /**
     * Background-only toys across a scan of 51 mass points: the mean number of up-crossings of a
     * level c follows E[N(c)] = E[N(c₀)]·exp(−(c − c₀)/2) (E. Gross, O. Vitells, Eur. Phys. J. C 70
     * (2010) 525, for a χ² process of one degree of freedom; references.md item 15), within three
     * combined toy standard errors. The scan steps (10) are well below the resonance width (25), so
     * few crossings are missed between points.
     */
    @Test
    void upcrossingsFallExponentiallyWithTheLevel() {
        List<Problem> problems = new ArrayList<>();
        for (double mass = 150; mass <= 650; mass += 10) {
            CompiledModel m = ModelCompiler.compile(resonanceAt(mass, 25, null));
            problems.add(Problem.observed(m));
        }
        int toys = LimitModels.full() ? 3000 : 600;
        double c0 = 0.5;
        double[] levels = {c0, 1.5, 2.5, 3.5};
        LookElsewhere.Toys t = LookElsewhere.toys(problems, 1.0, levels, toys, 7, 2, null);
        assertEquals(0, t.global().failed());
        double n0 = t.meanCrossings()[0];
        assertTrue(n0 > 1, "a low reference level is crossed often: " + n0);
        for (int l = 1; l < levels.length; l++) {
            double expected = n0 * Math.exp(-(levels[l] - c0) / 2);
            double err = Math.hypot(t.crossingErrors()[l], Math.exp(-(levels[l] - c0) / 2) * t.crossingErrors()[0]);
            assertEquals(expected, t.meanCrossings()[l], 3 * err, "level " + levels[l]);
        }
    }

    /** The asymptotic formula itself: p_global = p_local + N(c₀)·exp(−(c − c₀)/2) (Gross–Vitells eq. 2 form). */
    @Test
    void globalPValueFromUpcrossings() {
        double[] x = {1, 2, 3, 4, 5, 6, 7, 8};
        double[] q = {0.1, 0.9, 0.2, 1.5, 9.0, 0.3, 0.7, 0.2};
        LookElsewhere.Scan s = LookElsewhere.scan(x, q, 0.5);
        assertEquals(3, s.upcrossings());
        assertEquals(4, s.best());
        double pLocal = 0.5 * org.apache.commons.math3.special.Erf.erfc(3 / Math.sqrt(2));   // Z = 3
        assertEquals(pLocal, s.pLocalMax(), 1e-12);
        assertEquals(pLocal + 3 * Math.exp(-(9.0 - 0.5) / 2), s.pGlobal(), 1e-12);
        assertEquals(s.pGlobal() / pLocal, s.trials(), 1e-9);
    }
}
