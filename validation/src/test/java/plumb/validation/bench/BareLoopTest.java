package plumb.validation.bench;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The bare loop does the arithmetic it stands for on every entry: its sum and gradient against the
 * same sums taken entry by entry through the compiled model's element accessors.
 */
class BareLoopTest {

    @Test
    void sumsEveryShapeEntryOfTheModel() {
        CompiledModel m = BenchModels.compiled("medium");
        Random r = new Random(5);
        double[] x = new double[m.nParams()];
        for (int i = 0; i < x.length; i++) x[i] = r.nextGaussian();
        double[] rho = new double[m.nBins()];
        for (int b = 0; b < rho.length; b++) rho[b] = r.nextDouble() - 0.5;

        double[] gradient = new double[m.nParams()];
        double total = new BareLoop(m).pass(x, rho, gradient);

        double expectedTotal = 0;
        double[] expectedGradient = new double[m.nParams()];
        int shapeEntries = 0;
        for (int s = 0; s < m.nSamples(); s++) {
            int e0 = m.sampleEntryStart(s), bins = m.sampleEntryStart(s + 1) - e0;
            int b0 = m.channelBinStart(m.sampleChannel(s));
            for (int b = 0; b < bins; b++) {
                double yield = m.nominalYield(e0 + b);
                for (int k = m.sampleShapeStart(s); k < m.sampleShapeStart(s + 1); k++) {
                    double t = x[m.shapeParam(k)];
                    int i = m.shapeCoeffStart(k) + b;
                    yield += m.shapeS(i) * t + m.shapeA(i) * t * t;
                    expectedGradient[m.shapeParam(k)] += rho[b0 + b] * (m.shapeS(i) + 2 * m.shapeA(i) * t);
                    shapeEntries++;
                }
                expectedTotal += rho[b0 + b] * yield;
            }
        }
        assertTrue(shapeEntries > 1_000, "the medium model has shape entries: " + shapeEntries);
        // same sums in another order: equal to rounding
        assertEquals(expectedTotal, total, 1e-12 * m.entries());
        for (int p = 0; p < x.length; p++) assertEquals(expectedGradient[p], gradient[p], 1e-10, "parameter " + p);
    }
}
