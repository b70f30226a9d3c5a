package plumb.engine.likelihood;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.Sample;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The Gauss–Newton form of the Hessian ({@link BinnedNll#valueGradientCurvature}) against its
 * definition Σ_b (n_b/ν_b²) ∇ν_b ∇ν_bᵀ + constraint curvature (common practice), with ∇ν_b from
 * central differences of the expected counts, and the profiled layout against the Schur complement
 * of the explicit one computed with commons-math.
 */
class BinnedNllCurvatureTest {

    /** The mixed test model, or the same with MC-statistics errors on every sample (all bins fully in the MC term). */
    private static CompiledModel model(long seed, ModelOptions.McStatConstraint mc, boolean allMc) {
        Model base = TestModels.mixed(seed, mc);
        if (!allMc) return ModelCompiler.compile(base);
        List<Channel> channels = new ArrayList<>();
        for (Channel c : base.channels()) {
            List<Sample> samples = new ArrayList<>();
            for (Sample s : c.samples()) {
                double[] err = s.mcError();
                if (err == null) {
                    err = new double[s.yields().length];
                    for (int b = 0; b < err.length; b++) err[b] = 0.07 * s.yields()[b] + 0.1;
                }
                samples.add(new Sample(s.name(), s.yields(), err, s.factors(), s.variations()));
            }
            channels.add(new Channel(c.name(), c.observable(), c.edges(), c.observed(), samples));
        }
        return ModelCompiler.compile(new Model(base.format(), base.name(), base.description(), base.poi(), channels,
                base.parameters(), base.groups(), base.labels(), base.options()));
    }

    private static double[] randomPoint(CompiledModel m, int n, Random r) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = m.nominal(i) + 0.4 * (r.nextDouble() - 0.5);
            if (i >= m.nParams()) x[i] = 1 + 0.1 * (r.nextDouble() - 0.5);
        }
        x[m.indexOf("mu")] = 0.5 + r.nextDouble();
        return x;
    }

    @ParameterizedTest
    @CsvSource({"GAUSSIAN,1,false", "POISSON,2,false", "GAUSSIAN,3,true", "POISSON,4,true"})
    void explicitFormIsTheDataWeightedOuterProductOfTheExpectationGradients(ModelOptions.McStatConstraint mc,
                                                                           long seed, boolean allMc) {
        CompiledModel m = model(seed, mc, allMc);
        DataSet data = DataSet.observed(m);
        // The same data without events: the curvature form then holds only the constraint terms.
        DataSet empty = DataSet.of(m, "empty", new double[m.nBins()], data.channelIncluded(), data.aux());
        BinnedNll nll = new BinnedNll(m, data, true);
        BinnedNll none = new BinnedNll(m, empty, true);
        int n = nll.dimension();
        Random r = new Random(seed);
        for (int trial = 0; trial < 3; trial++) {
            double[] x = randomPoint(m, n, r);
            double[] g = new double[n], c = new double[n * n], c0 = new double[n * n], gh = new double[n];
            double f = nll.valueGradientCurvature(x, g, c);
            assertEquals(nll.valueAndGradient(x, gh), f, 0.0);
            for (int i = 0; i < n; i++) assertEquals(gh[i], g[i], 0.0, "the gradient is the ordinary one");
            none.valueGradientCurvature(x, new double[n], c0);
            double[][] jac = expectationJacobian(nll, x, m.nBins());
            double[] nu = new double[m.nBins()];
            nll.expectedBins(x, nu);
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    double want = 0;
                    for (int b = 0; b < m.nBins(); b++) {
                        want += data.counts()[b] / (nu[b] * nu[b]) * jac[b][i] * jac[b][j];
                    }
                    assertEquals(want, c[i * n + j] - c0[i * n + j], 1e-6 * (1 + Math.abs(want)),
                            m.parameterNames(i) + "," + m.parameterNames(j));
                }
            }
        }
    }

    /** ∂ν_b/∂x_i by central differences of {@link BinnedNll#expectedBins}. */
    private static double[][] expectationJacobian(BinnedNll nll, double[] x, int bins) {
        int n = x.length;
        double[][] jac = new double[bins][n];
        double[] up = new double[bins], down = new double[bins];
        for (int i = 0; i < n; i++) {
            double step = 1e-6;
            double[] xp = x.clone(), xm = x.clone();
            xp[i] += step;
            xm[i] -= step;
            nll.expectedBins(xp, up);
            nll.expectedBins(xm, down);
            for (int b = 0; b < bins; b++) jac[b][i] = (up[b] - down[b]) / (2 * step);
        }
        return jac;
    }

    @ParameterizedTest
    @CsvSource({"GAUSSIAN,5,false", "POISSON,6,false", "GAUSSIAN,7,true", "POISSON,8,true"})
    void profiledFormIsTheSchurComplementOfTheExplicitOne(ModelOptions.McStatConstraint mc, long seed,
                                                         boolean allMc) {
        CompiledModel m = model(seed, mc, allMc);
        DataSet data = DataSet.observed(m);
        BinnedNll profiled = new BinnedNll(m, data, false);
        BinnedNll explicit = new BinnedNll(m, data, true);
        int nP = m.nParams(), nA = m.nAll();
        Random r = new Random(seed);
        double[] x = Arrays.copyOf(randomPoint(m, nA, r), nP);
        double[] all = new double[nA];
        profiled.allValues(x, all);
        for (int g = nP; g < nA; g++) assertTrue(all[g] > m.lower(g) && all[g] < m.upper(g), "γ inside its range");
        double[] cp = new double[nP * nP], ce = new double[nA * nA];
        profiled.valueGradientCurvature(x, new double[nP], cp);
        explicit.valueGradientCurvature(all, new double[nA], ce);
        RealMatrix e = new Array2DRowRealMatrix(nA, nA);
        for (int i = 0; i < nA; i++) for (int j = 0; j < nA; j++) e.setEntry(i, j, ce[i * nA + j]);
        RealMatrix a = e.getSubMatrix(0, nP - 1, 0, nP - 1);
        RealMatrix b = e.getSubMatrix(0, nP - 1, nP, nA - 1);
        RealMatrix d = e.getSubMatrix(nP, nA - 1, nP, nA - 1);
        RealMatrix schur = a.subtract(b.multiply(new LUDecomposition(d).getSolver().getInverse()).multiply(b.transpose()));
        for (int i = 0; i < nP; i++) {
            for (int j = 0; j < nP; j++) {
                double want = schur.getEntry(i, j);
                assertEquals(want, cp[i * nP + j], 1e-9 * (1 + Math.abs(want)),
                        m.parameterNames(i) + "," + m.parameterNames(j));
            }
        }
    }

    @Test
    void positiveSemidefiniteWhereTheHessianIsNot() {
        CompiledModel m = model(9, ModelOptions.McStatConstraint.GAUSSIAN, true);
        // Data far above the model: w_b = 1 − n_b/ν_b strongly negative, so the terms w_b ∇²ν_b
        // dominate the exact Hessian.
        double[] counts = DataSet.observed(m).counts().clone();
        for (int b = 0; b < counts.length; b++) counts[b] = 6 * counts[b] + 40;
        DataSet data = DataSet.of(m, "far", counts, DataSet.observed(m).channelIncluded(), m.auxNominal());
        BinnedNll nll = new BinnedNll(m, data);
        int n = nll.dimension();
        double[] x = Arrays.copyOf(m.nominal(), n);
        x[m.indexOf("mu")] = 0.2;
        x[m.indexOf("shapeB")] = -2.5;
        x[m.indexOf("scale")] = 1.5;
        double[] h = new double[n * n], c = new double[n * n];
        nll.valueGradientHessian(x, new double[n], h);
        nll.valueGradientCurvature(x, new double[n], c);
        double[] exact = eigenvalues(h, n, m);
        double[] form = eigenvalues(c, n, m);
        assertTrue(exact[0] < 0, "precondition: the exact Hessian is indefinite here, smallest " + exact[0]);
        assertTrue(form[0] > -1e-12 * form[form.length - 1], "smallest eigenvalue " + form[0]);
    }

    @Test
    void equalsTheHessianWhereTheModelMatchesTheData() {
        CompiledModel m = model(10, ModelOptions.McStatConstraint.POISSON, true);
        int nP = m.nParams();
        double[] x = Arrays.copyOf(m.nominal(), nP);
        double[] nu = new double[m.nBins()];
        // The expectation at x with every γ = 1 (explicit layout).
        double[] withGamma = Arrays.copyOf(x, m.nAll());
        Arrays.fill(withGamma, nP, m.nAll(), 1.0);
        new BinnedNll(m, DataSet.observed(m), true).expectedBins(withGamma, nu);
        // Asimov data at x with nominal auxiliary values: every γ solves to 1 and w_b = 0.
        DataSet asimov = DataSet.of(m, "asimov", nu, DataSet.observed(m).channelIncluded(), m.auxNominal());
        BinnedNll nll = new BinnedNll(m, asimov);
        double[] h = new double[nP * nP], c = new double[nP * nP];
        nll.valueGradientHessian(x, new double[nP], h);
        nll.valueGradientCurvature(x, new double[nP], c);
        for (int i = 0; i < nP * nP; i++) assertEquals(h[i], c[i], 1e-9 * (1 + Math.abs(h[i])));
    }

    /** Eigenvalues over the free parameters, ascending (commons-math). */
    private static double[] eigenvalues(double[] h, int n, CompiledModel m) {
        int[] free = java.util.stream.IntStream.range(0, n).filter(i -> !m.fixed(i)).toArray();
        RealMatrix a = new Array2DRowRealMatrix(free.length, free.length);
        for (int i = 0; i < free.length; i++) {
            for (int j = 0; j < free.length; j++) a.setEntry(i, j, h[free[i] * n + free[j]]);
        }
        double[] ev = new EigenDecomposition(a).getRealEigenvalues();
        Arrays.sort(ev);
        return ev;
    }
}
