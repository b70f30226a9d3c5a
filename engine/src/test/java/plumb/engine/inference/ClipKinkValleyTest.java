package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.model.ModelReader;

import java.util.Arrays;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A narrow peak whose two shift terms and width term push the one-event wings of the signal to
 * zero together, with no events seen there: the minimum lies on one or two clip kinks of
 * max(0, ·) in valleys (f rises beyond them). Newton's hinge step stops on them in a few
 * iterations (the step logic without it needed 53 and 129 iterations, 1,576 and 5,809
 * evaluations, for these two data sets). The point is checked as a minimum without the
 * minimiser's own words: no value of −ln L around it is lower, and an independent derivative-free
 * minimiser (BOBYQA, references.md item 11) started there finds nothing lower.
 */
class ClipKinkValleyTest {

    static final String MODEL = """
            {"format": "plumb-model/1", "name": "valleys", "poi": "mu", "channels": [{"name": "peak", "samples": [
              {"name": "signal", "yields": [0.4, 1, 2.5, 6, 9, 6, 2.5, 1, 0.4], "factors": ["mu"], "variations": [
                {"parameter": "shift_a", "shape": {"down": [1.2, 2.4, 5, 8, 7, 3, 0.8, 0, 0], "up": [0, 0, 0.5, 3.5, 7.5, 8.5, 5, 2.4, 1.3]}},
                {"parameter": "shift_b", "shape": {"down": [0.9, 1.8, 3.8, 7, 8, 4.5, 1.5, 0.2, 0], "up": [0, 0.2, 1.5, 5, 8.5, 7.5, 3.8, 1.8, 0.9]}},
                {"parameter": "width", "shape": {"down": [0, 0.3, 2, 7, 11, 7, 2, 0.3, 0], "up": [1, 1.8, 3.2, 5.5, 6.5, 5.5, 3.2, 1.8, 1]}}]},
              {"name": "bkg", "yields": [0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3]}],
              "observed": [%s]}]}
            """;

    @ParameterizedTest
    @CsvSource(delimiter = ';', value = {"0, 0, 2, 10, 12, 3, 2, 0, 0; 2", "0, 0, 1, 12, 12, 2, 1, 0, 0; 1"})
    void newtonStopsOnTheValleyKinksInAFewIterations(String observed, int kinks) {
        CompiledModel m = ModelCompiler.compile(ModelReader.parse(MODEL.formatted(observed), "valleys.json"));
        DataSet data = DataSet.observed(m);
        FitResult r = new Fitter(m, data, FitSettings.defaults()).fit();
        assertEquals(MinimumStatus.CONVERGED_AT_KINK, r.status());
        assertTrue(r.evaluations() <= 30, r.evaluations() + " evaluations");
        double[] x = Arrays.copyOf(r.values(), m.nParams());
        BinnedNll nll = new BinnedNll(m, data);
        assertEquals(kinks, nll.entriesAtClip(x, 1e-6, new int[8]));
        double f = nll.value(x);
        assertEquals(r.nll(), f, 1e-12);

        // no lower value in a small neighbourhood, along random directions (one-sided differences
        // see the kinks: a smooth-side test alone would not)
        Random random = new Random(5);
        for (int k = 0; k < 400; k++) {
            double[] y = x.clone();
            for (int i = 0; i < y.length; i++) {
                y[i] += 1e-4 * r.errors()[i] * random.nextGaussian();
            }
            y[m.poi()] = Math.max(y[m.poi()], 0);
            assertTrue(nll.value(y) >= f - 1e-12, "lower value near the point: " + (nll.value(y) - f));
        }
        // BOBYQA from the point finds nothing lower
        FitResult reference = new Fitter(m, data, FitSettings.defaults().withMinimiser(FitSettings.MinimiserKind.REFERENCE))
                .fit(r.values(), -1, 0);
        assertTrue(reference.nll() >= r.nll() - 1e-9, reference.nll() + " vs " + r.nll());
    }

    /**
     * With MC-statistics errors on both samples, in the profiled and the explicit layout: both stop
     * on the kinks at the same −ln L (the explicit layout's γ minimised by Newton, the profiled
     * one's in closed form), where the step logic without the hinge step needed 5,164 evaluations
     * (profiled) and ran out of its 4,000 (explicit).
     */
    @Test
    void bothMcStatisticsLayoutsStopOnTheKinksAtTheSameMinimum() {
        String model = MODEL.formatted("0, 0, 2, 10, 12, 3, 2, 0, 0")
                .replace("\"factors\": [\"mu\"],", "\"factors\": [\"mu\"], \"mcError\": [0.1, 0.2, 0.3, 0.5, 0.6, 0.5, 0.3, 0.2, 0.1],")
                .replace("\"yields\": [0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3]",
                        "\"yields\": [0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3, 0.3], \"mcError\": [0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1]");
        CompiledModel m = ModelCompiler.compile(ModelReader.parse(model, "valleys.json"));
        assertEquals(9, m.nGamma());
        DataSet data = DataSet.observed(m);
        FitResult profiled = new Fitter(m, data, FitSettings.defaults()).fit();
        FitResult explicit = new Fitter(m, data, FitSettings.defaults().withExplicitGamma(true)).fit();
        for (FitResult r : new FitResult[] {profiled, explicit}) {
            assertEquals(MinimumStatus.CONVERGED_AT_KINK, r.status());
            assertTrue(r.evaluations() <= 30, r.evaluations() + " evaluations");
        }
        assertEquals(profiled.nll(), explicit.nll(), 1e-9);
        assertEquals(profiled.values()[m.poi()], explicit.values()[m.poi()], 1e-5);
    }
}
