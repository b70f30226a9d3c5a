package plumb.engine.likelihood;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.ModelOptions;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The analytic gradient and Hessian against central finite differences of the value (common
 * practice), in both layouts and with both MC-statistics constraints, at random points.
 */
class BinnedNllDerivativesTest {

    @ParameterizedTest
    @CsvSource({"false,GAUSSIAN,1", "true,GAUSSIAN,2", "false,POISSON,3", "true,POISSON,4", "false,GAUSSIAN,5"})
    void gradientAndHessianMatchFiniteDifferences(boolean explicit, ModelOptions.McStatConstraint mc, long seed) {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(seed, mc));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
        int n = nll.dimension();
        Random r = new Random(seed);
        for (int trial = 0; trial < 3; trial++) {
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = m.nominal(i) + 0.4 * (r.nextDouble() - 0.5);
                if (i >= m.nParams()) x[i] = 1 + 0.1 * (r.nextDouble() - 0.5);
            }
            x[m.indexOf("mu")] = 0.5 + r.nextDouble();
            double[] g = new double[n], h = new double[n * n];
            double f = nll.valueGradientHessian(x, g, h);
            assertEquals(f, nll.value(x), 1e-12 * Math.abs(f));
            double[] gp = new double[n], gm = new double[n];
            for (int i = 0; i < n; i++) {
                double step = 1e-5;
                double[] xp = x.clone(), xm = x.clone();
                xp[i] += step;
                xm[i] -= step;
                double fd = (nll.value(xp) - nll.value(xm)) / (2 * step);
                assertEquals(fd, g[i], 1e-5 * (1 + Math.abs(fd)), "gradient " + m.parameterNames(i));
                nll.valueAndGradient(xp, gp);
                nll.valueAndGradient(xm, gm);
                for (int j = 0; j < n; j++) {
                    double hd = (gp[j] - gm[j]) / (2 * step);
                    assertEquals(hd, h[i * n + j], 1e-4 * (1 + Math.abs(hd)),
                            "hessian " + m.parameterNames(i) + "," + m.parameterNames(j));
                }
            }
        }
    }

    /** Far from the nominal (linear branches of every interpolation) the gradient stays exact. */
    @ParameterizedTest
    @CsvSource({"false", "true"})
    void gradientStaysExactFarOut(boolean explicit) {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(7, ModelOptions.McStatConstraint.GAUSSIAN));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
        double[] x = m.nominal();
        if (!explicit) x = java.util.Arrays.copyOf(x, m.nParams());
        int scale = m.indexOf("shapeB");
        x[scale] = -4.5; // a 12 % tilt pulled 4.5σ down turns some bins negative only for extreme values
        double[] g = new double[x.length];
        double f = nll.valueAndGradient(x, g);
        assertTrue(Double.isFinite(f));
        double step = 1e-6;
        double[] xp = x.clone(), xm = x.clone();
        xp[scale] += step;
        xm[scale] -= step;
        assertEquals((nll.value(xp) - nll.value(xm)) / (2 * step), g[scale], 1e-4 * (1 + Math.abs(g[scale])));
    }
}
