package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** The discovery test across several signal hypotheses: order, local tests, global estimate, toys. */
class DiscoveryAcrossModelsTest {

    private static final double[] COUNTS = {110, 130, 95};
    private static final double[] BACKGROUND = {100, 100, 100};

    /** Three bins of known background and data; the signal sits in bin {@code at} only, no nuisances. */
    private static Problem hypothesis(int at) {
        double[] s = new double[3];
        s[at] = 10;
        Channel ch = new Channel("spectrum", "m", new double[] {0, 1, 2, 3}, COUNTS, List.of(
                new Sample("signal", s, null, List.of("mu"), List.of()),
                new Sample("background", BACKGROUND, null, List.of(), List.of())));
        CompiledModel m = ModelCompiler.compile(new Model(Model.FORMAT, "bin" + at, null, "mu", List.of(ch),
                List.of(new ParameterSpec("mu", null, new double[] {0, 20}, null, null, false)), Map.of(), Map.of(), null));
        return DataRequest.observed().forFit(m, Map.of(), FitSettings.defaults(), 1).problem();
    }

    /**
     * q0 of one Poisson bin with known background b and n > b counts: 2 (n ln(n/b) − (n − b)), the one-bin
     * counting form of Cowan et al. 2011 with s = n − b (from memory).
     */
    private static double countingQ0(double n, double b) {
        return n > b ? 2 * (n * Math.log(n / b) - (n - b)) : 0;
    }

    @Test
    void pointsComeInTheOrderOfTheirPositionsWithTheLocalTestOfEach() {
        List<Problem> problems = List.of(hypothesis(2), hypothesis(0), hypothesis(1));
        double[] x = {30, 10, 20};
        DiscoveryAcrossModels.Result r = DiscoveryAcrossModels.compute(problems, x, 0.5, null, 1, 2, null);
        assertArrayEquals(new int[] {1, 2, 0}, r.order());
        assertArrayEquals(new double[] {10, 20, 30}, r.x());
        double[] q = new double[3];
        for (int i = 0; i < 3; i++) {
            // The bins without signal are fitted exactly by the background alone, so q0 is the one-bin value.
            double expected = countingQ0(COUNTS[i], BACKGROUND[i]);
            assertEquals(expected, r.observed().get(i).q0(), 1e-4 * Math.max(1, expected), "point " + i);
            assertEquals(Discovery.compute(problems.get(r.order()[i])).q0(), r.observed().get(i).q0(), 1e-12);
            q[i] = r.observed().get(i).q0();
        }
        assertEquals(0, r.observed().get(2).q0(), 1e-9, "a deficit gives q0 = 0");
        assertEquals(1, r.scan().best(), "the largest excess is in the middle bin");
        LookElsewhere.Scan direct = LookElsewhere.scan(r.x(), q, 0.5);
        assertEquals(direct.pGlobal(), r.scan().pGlobal(), 0);
        assertEquals(direct.upcrossings(), r.scan().upcrossings());
        assertNull(r.toys());
    }

    @Test
    void toysDependOnlyOnTheSeed() {
        List<Problem> problems = new ArrayList<>(List.of(hypothesis(0), hypothesis(1), hypothesis(2)));
        double[] x = {1, 2, 3};
        int[] seen = new int[1];
        DiscoveryAcrossModels.Result a = DiscoveryAcrossModels.compute(problems, x, 0.5, 12, 7, 2,
                done -> { synchronized (seen) { seen[0] = Math.max(seen[0], done); } });
        DiscoveryAcrossModels.Result b = DiscoveryAcrossModels.compute(problems, x, 0.5, 12, 7, 1, null);
        assertEquals(12, seen[0], "every toy is reported");
        assertEquals(12, a.toys().global().toys());
        assertArrayEquals(a.toys().maxQ0(), b.toys().maxQ0(), 0, "the same toys with one thread or two");
        assertEquals(5, a.toys().levels().length);
        assertEquals(0.5, a.toys().levels()[0]);
    }

    @Test
    void badOptionsAreRefused() {
        List<Problem> one = List.of(hypothesis(0));
        assertThrows(IllegalArgumentException.class, () -> DiscoveryAcrossModels.compute(one, new double[] {1}, 0, null, 1, 1, null));
        assertThrows(IllegalArgumentException.class, () -> DiscoveryAcrossModels.compute(one, new double[] {1}, 1, 0, 1, 1, null));
        assertThrows(IllegalArgumentException.class, () -> DiscoveryAcrossModels.compute(one, new double[] {1, 2}, 1, null, 1, 1, null));
    }
}
