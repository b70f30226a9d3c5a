package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Channel;
import plumb.engine.model.Interpolation;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

class InjectionToysTest {

    private static final int[] NONE = new int[0];
    private static final double[] NO_VALUES = new double[0];

    private static void assertSameToys(ToyFit[] expected, ToyFit[] actual) {
        assertEquals(expected.length, actual.length);
        for (int i = 0; i < expected.length; i++) {
            ToyFit a = expected[i], b = actual[i];
            assertEquals(a.index(), b.index());
            assertEquals(a.status(), b.status());
            // bit for bit: Double.equals compares the bits
            assertEquals(Double.valueOf(a.poi()), Double.valueOf(b.poi()), "toy " + i);
            assertEquals(Double.valueOf(a.poiError()), Double.valueOf(b.poiError()), "toy " + i);
            assertArrayEquals(a.nuisancePulls(), b.nuisancePulls(), 0.0, "toy " + i);
        }
    }

    /** Results do not depend on the thread count (docs/engine.md section 6: per-toy seeds, stored by index). */
    @Test
    void threadCountDoesNotChangeResults() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(2, ModelOptions.McStatConstraint.GAUSSIAN));
        InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), NONE, NO_VALUES);
        double[] point = toys.generatingPoint(1.5, false).values();
        ToyFit[] one = toys.run(point, 42, true, 0, 40, 1, null);
        ToyFit[] three = toys.run(point, 42, true, 0, 40, 3, null);
        assertSameToys(one, three);
        assertTrue(Arrays.stream(one).filter(ToyFit::usable).count() >= 36, "most toys converge");
    }

    /** A batch (first, count) is a pure function: two batches equal the one run of all their toys. */
    @Test
    void batchesEqualOneRun() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(3, ModelOptions.McStatConstraint.POISSON));
        InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), NONE, NO_VALUES);
        double[] point = toys.generatingPoint(0.5, true).values();
        ToyFit[] all = toys.run(point, 9, true, 100, 30, 2, null);
        ToyFit[] a = toys.run(point, 9, true, 100, 12, 2, null);
        ToyFit[] b = toys.run(point, 9, true, 112, 18, 1, null);
        ToyFit[] joined = Arrays.copyOf(a, 30);
        System.arraycopy(b, 0, joined, 12, 18);
        assertSameToys(all, joined);
        assertEquals(100, all[0].index());
    }

    /**
     * Toys follow docs/model-format.md, "Generated data sets": n_b ~ Poisson(ν_b(θ_gen)), Gaussian
     * centres ~ N(θ_gen, w), Poisson counts m ~ Poisson(τγ_gen); without fluctuation the auxiliary
     * values are the generating ones. Checked by the sample means and variances over 4000 toys
     * against the distributions' moments, within 4.5 standard errors (a two-sided 4.5σ band fails by
     * chance with probability 7e-6 per check, common practice).
     */
    @Test
    void toysFollowTheFormatPage() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(1, ModelOptions.McStatConstraint.POISSON));
        double[] point = m.nominal();
        point[m.poi()] = 2;
        point[m.indexOf("lumi")] = 0.4;
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        int n = 4000;
        double[] sum = new double[m.nBins()], sum2 = new double[m.nBins()];
        double[] aSum = new double[m.nAll()], aSum2 = new double[m.nAll()];
        for (int t = 0; t < n; t++) {
            DataSet d = Toys.generate(m, expected, point, all, 5, t, true);
            for (int b = 0; b < m.nBins(); b++) {
                sum[b] += d.counts()[b];
                sum2[b] += d.counts()[b] * d.counts()[b];
            }
            for (int i = 0; i < m.nAll(); i++) {
                aSum[i] += d.aux()[i];
                aSum2[i] += d.aux()[i] * d.aux()[i];
            }
        }
        for (int b = 0; b < m.nBins(); b++) {
            double mean = sum[b] / n, var = sum2[b] / n - mean * mean, nu = expected[b];
            assertEquals(nu, mean, 4.5 * Math.sqrt(nu / n), "bin " + b);               // Poisson mean ν, variance ν
            assertEquals(nu, var, 4.5 * Math.sqrt((nu + 2 * nu * nu) / n), "bin " + b); // var of s²: (μ4 − σ⁴)/N
        }
        int gaussian = 0, poisson = 0;
        for (int i = 0; i < m.nAll(); i++) {
            double mean = aSum[i] / n, var = aSum2[i] / n - mean * mean;
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
                gaussian++;
                double w = m.width(i);
                assertEquals(point[i], mean, 4.5 * w / Math.sqrt(n), m.parameterNames(i));
                assertEquals(w * w, var, 4.5 * w * w * Math.sqrt(2.0 / n), m.parameterNames(i));
            } else if (m.constraintType(i) == ConstraintType.POISSON) {
                poisson++;
                double mu = m.tau(i) * point[i];
                assertEquals(mu, mean, 4.5 * Math.sqrt(mu / n), m.parameterNames(i));
            }
        }
        assertTrue(gaussian > 0 && poisson > 0);
        DataSet still = Toys.generate(m, expected, point, all, 5, 0, false);
        assertArrayEquals(DataSets.generatingAux(m, point), still.aux(), 0.0);
    }

    /**
     * A model linear in its parameters with large yields (linear, symmetric variations: no kink)
     * gives an unbiased estimator with Gaussian errors: POI and nuisance pulls have mean 0 and
     * width 1, and ±1σ intervals cover 68.27 %, within 3 standard errors of the toy count
     * (references.md item 12, common practice; item 10 for the linear, large-yield regime).
     */
    @Test
    void linearModelPullsAreUnbiased() {
        CompiledModel m = ModelCompiler.compile(linearModel());
        InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), NONE, NO_VALUES);
        double[] point = toys.generatingPoint(1, false).values();
        int[] pulled = toys.pulledParameters();
        String[] names = new String[pulled.length];
        for (int k = 0; k < names.length; k++) names[k] = m.parameterNames(pulled[k]);
        InjectionSummary s = InjectionSummary.of(1, toys.run(point, 3, true, 0, 400, 2, null), names);
        assertEquals(400, s.converged());
        assertEquals(0, s.pullMean(), 3 * s.pullMeanError());
        assertEquals(1, s.pullWidth(), 3 * s.pullWidthError());
        assertEquals(InjectionSummary.GAUSSIAN_68, s.coverage68(), 3 * s.coverage68Error());
        assertEquals(3, s.nuisances().size());
        for (InjectionSummary.NuisancePull p : s.nuisances()) {
            assertEquals(0, p.pullMean(), 3 * p.pullMeanError(), p.parameter());
            assertEquals(1, p.pullWidth(), 3 * p.pullWidthError(), p.parameter());
        }
    }

    /**
     * A toy's result is that of an ordinary fit with errors to the same toy data from the same
     * start ({@link ToyStart}), bit for bit: the toys leave out only what they do not keep (the fit checks).
     */
    @Test
    void toysEqualOrdinaryFitsOfTheirData() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(2, ModelOptions.McStatConstraint.POISSON));
        InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), NONE, NO_VALUES);
        double[] point = toys.generatingPoint(1.5, false).values();
        ToyFit[] fits = toys.run(point, 11, true, 0, 12, 1, null);
        int[] pulled = toys.pulledParameters();
        double[] expected = DataSets.expectedCounts(m, point);
        boolean[] all = new boolean[m.nChannels()];
        Arrays.fill(all, true);
        for (ToyFit t : fits) {
            Fitter plain = new Fitter(m, Toys.generate(m, expected, point, all, 11, t.index(), true), FitSettings.defaults());
            FitResult r = plain.fit(new ToyStart(plain, point, expected, all, NONE).of(plain), NONE, NO_VALUES);
            assertTrue(Double.isFinite(r.checks().smallestEigenvalue()) || !r.converged(), "the plain fit makes its checks");
            assertEquals(r.status(), t.status());
            assertEquals(Double.valueOf(r.values()[m.poi()]), Double.valueOf(t.poi()), "toy " + t.index());
            assertEquals(Double.valueOf(r.errors()[m.poi()]), Double.valueOf(t.poiError()), "toy " + t.index());
            for (int k = 0; k < pulled.length; k++) {
                int p = pulled[k];
                double pull = r.errors()[p] > 0 ? (r.values()[p] - point[p]) / r.errors()[p] : Double.NaN;
                assertEquals(Double.valueOf(pull), Double.valueOf(t.nuisancePulls()[k]), m.parameterNames(p));
            }
        }
        assertTrue(Arrays.stream(fits).filter(ToyFit::usable).count() >= 10, "most toys converge");
    }

    /** The Asimov closure returns every parameter to its generating value within 1e-6. */
    @Test
    void asimovClosureOnTheMixedModel() {
        for (ModelOptions.McStatConstraint mc : ModelOptions.McStatConstraint.values()) {
            CompiledModel m = ModelCompiler.compile(TestModels.mixed(4, mc));
            InjectionToys toys = new InjectionToys(m, FitSettings.defaults(), NONE, NO_VALUES);
            for (boolean postfit : new boolean[] {false, true}) {
                AsimovClosure c = toys.closure(toys.generatingPoint(2.5, postfit).values());
                assertTrue(c.passed(), mc + " postfit " + postfit + ": " + c.maxDeviation());
                assertEquals(2.5, c.fit().values()[m.poi()], InjectionToys.CLOSURE_TOLERANCE);
            }
        }
    }

    /** Two channels of 10 bins, thousands of events per bin, linear symmetric variations. */
    static Model linearModel() {
        List<Channel> channels = new ArrayList<>();
        for (int c = 0; c < 2; c++) {
            double[] sig = new double[10], bkg = new double[10], up = new double[10], down = new double[10];
            for (int b = 0; b < 10; b++) {
                sig[b] = 400 * Math.exp(-0.5 * Math.pow((b - 4.5) / 1.5, 2)) * (c == 0 ? 1 : 0.3);
                bkg[b] = 5000 - 300 * b;
                up[b] = bkg[b] * (1 + 0.04 * (b - 4.5) / 4.5);
                down[b] = bkg[b] * (1 - 0.04 * (b - 4.5) / 4.5);
            }
            List<Variation> sv = List.of(new Variation("eff", new Variation.NormEffect(0.95, 1.05), null,
                    Interpolation.LINEAR, null));
            List<Variation> bv = List.of(
                    new Variation("bnorm", new Variation.NormEffect(0.97, 1.03), null, Interpolation.LINEAR, null),
                    new Variation("tilt", null, new Variation.ShapeEffect(down, up), null, Interpolation.LINEAR));
            double[] obs = new double[10];
            for (int b = 0; b < 10; b++) obs[b] = Math.round(sig[b] + bkg[b]);
            channels.add(new Channel("ch" + c, null, null, obs, List.of(
                    new Sample("signal", sig, null, List.of("mu"), sv),
                    new Sample("background", bkg, null, List.of(), bv))));
        }
        List<ParameterSpec> params = List.of(new ParameterSpec("mu", null, new double[] {-5, 10}, null, null, false));
        return new Model(Model.FORMAT, "linear", null, "mu", channels, params, Map.of(), Map.of(), null);
    }
}
