package plumb.validation;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Impacts;
import plumb.engine.likelihood.DataSet;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Impacts and the grouped breakdown against closed forms and a general-purpose linear-algebra library. */
class ImpactsReferenceTest {

    private static final int BINS = 6;

    /**
     * Linear model, Gaussian constraints, yields ~1e8: the post-fit values and covariance equal the
     * generalised least-squares solution β̂ = (XᵀWX + P)⁻¹ XᵀW(n − b), Σ = (XᵀWX + P)⁻¹ with
     * W = diag(1/n_b), solved here with commons-math; and every exact post-fit impact equals
     * ±ρ(μ, θ_k)σ_μ = ±Σ_μk/σ_k. references.md item 10 (common practice, exact in the linear case).
     * Tolerance 1e-3 (relative to each error): Poisson and Gaussian terms differ by O((n − ν)/n) ≈ 1e-4 here.
     */
    @Test
    void linearGaussianModelMatchesGeneralisedLeastSquares() {
        double[] s = new double[BINS], b = new double[BINS], n = new double[BINS];
        double[][] effects = new double[3][BINS];
        for (int i = 0; i < BINS; i++) {
            b[i] = 1e8 * (1 + 0.2 * i);
            s[i] = 2e5 * Math.exp(-0.5 * (i - 2.5) * (i - 2.5));
            // effects of the order of √n, so that the data and the constraints both count
            effects[0][i] = 1.5e4;                       // flat normalisation-like
            effects[1][i] = 1.2e4 * (i - 2.5) / 2.5;     // tilt
            effects[2][i] = 1e4 * ((i % 2 == 0) ? 1 : -1) + 3e3;
            // fixed "fluctuations" of about one standard deviation, and a signal of μ = 1.3
            n[i] = b[i] + 1.3 * s[i] + 1e4 * Math.sin(1.7 * i + 0.3) + 0.4 * effects[1][i];
        }
        CompiledModel m = ModelCompiler.compile(LinearModels.channel(s, b, effects, n));
        DataSet data = DataSet.observed(m);
        FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
        assertTrue(best.converged(), best.status().toString());

        // GLS with commons-math, parameters ordered (μ, θ0, θ1, θ2) as the model's.
        int p = 4;
        RealMatrix x = new Array2DRowRealMatrix(BINS, p);
        RealVector r = new ArrayRealVector(BINS);
        for (int i = 0; i < BINS; i++) {
            x.setEntry(i, m.indexOf("mu"), s[i]);
            for (int k = 0; k < 3; k++) x.setEntry(i, m.indexOf("theta" + k), effects[k][i]);
            r.setEntry(i, (n[i] - b[i]) / n[i]);
        }
        RealMatrix w = new Array2DRowRealMatrix(BINS, BINS);
        for (int i = 0; i < BINS; i++) w.setEntry(i, i, 1 / n[i]);
        RealMatrix normal = x.transpose().multiply(w).multiply(x);
        for (int k = 0; k < 3; k++) {
            int j = m.indexOf("theta" + k);
            normal.addToEntry(j, j, 1.0);   // unit Gaussian constraint centred on 0
        }
        RealVector rhs = x.transpose().operate(r);
        CholeskyDecomposition chol = new CholeskyDecomposition(normal);
        RealVector beta = chol.getSolver().solve(rhs);
        RealMatrix cov = chol.getSolver().getInverse();

        for (int i = 0; i < p; i++) {
            double sigma = Math.sqrt(cov.getEntry(i, i));
            assertEquals(beta.getEntry(i), best.values()[i], 1e-3 * sigma, m.parameterNames(i));
            for (int j = 0; j < p; j++) {
                double scale = Math.sqrt(cov.getEntry(i, i) * cov.getEntry(j, j));
                assertEquals(cov.getEntry(i, j), best.covariance()[i * m.nParams() + j], 1e-3 * scale);
            }
        }

        Impacts impacts = new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, false);
        List<Impacts.Entry> ranking = impacts.rank(-1, 2, null);
        assertEquals(3, ranking.size());
        int mu = m.poi();
        double sigmaMu = Math.sqrt(cov.getEntry(mu, mu));
        for (Impacts.Entry e : ranking) {
            int k = e.parameter();
            double expected = cov.getEntry(mu, k) / Math.sqrt(cov.getEntry(k, k));   // ρ σ_μ
            assertTrue(e.postfit().converged());
            assertEquals(expected, e.postfit().up(), 1e-3 * sigmaMu, e.name());
            assertEquals(-expected, e.postfit().down(), 1e-3 * sigmaMu, e.name());
            assertEquals(expected, e.linearPostfit().up(), 1e-3 * sigmaMu, e.name());
            // pre-fit width 1: Δμ = Σ_μk/Σ_kk · 1
            assertEquals(cov.getEntry(mu, k) / cov.getEntry(k, k), e.prefit().up(), 1e-3 * sigmaMu, e.name());
        }
        for (int i = 1; i < ranking.size(); i++) {
            assertTrue(ranking.get(i - 1).size() >= ranking.get(i).size(), "sorted by size, largest first");
        }
    }

    /**
     * Grouped breakdown on a linear single-bin model whose groups are uncorrelated after the fit:
     * total² = stat² + Σ groups² exactly (common practice), with every term also equal to its
     * closed form: stat = √n/s (references.md item 1), group G = √(Σ_{k∈G} S_k²)/s, MC statistics
     * = δ·b2/s (the γ's Gaussian width propagated through ν = … + γ·b2).
     */
    @Test
    void breakdownAddsUpInQuadrature() {
        double s = 40, b1 = 900, b2 = 300, delta = 0.05, n = 1400;
        double[] effects = {30, 45, 12, 20};
        Map<String, List<String>> groups = new LinkedHashMap<>();
        groups.put("detector", List.of("theta0", "theta1"));
        groups.put("theory", List.of("theta2"));
        groups.put("other", List.of("theta3"));
        CompiledModel m = ModelCompiler.compile(LinearModels.singleBin(s, b1, effects, b2, delta, n, groups));
        DataSet data = DataSet.observed(m);
        FitResult best = new Fitter(m, data, FitSettings.defaults()).fit();
        assertTrue(best.converged(), best.status().toString());
        Impacts.Breakdown br = new Impacts(m, data, FitSettings.defaults(), new int[0], new double[0], best, true).breakdown();

        double expectedTotal = Math.sqrt(n + effects[0] * effects[0] + effects[1] * effects[1] + effects[2] * effects[2]
                + effects[3] * effects[3] + delta * delta * b2 * b2) / s;
        // tolerance 1e-7: the Hessian is taken at the fitted ν, which the minimiser's stopping rule
        // (Newton decrement < 1e-8) leaves within ~1e-8 relative of n; the identities below are algebraic (1e-10)
        assertEquals(expectedTotal, br.total(), 1e-7 * expectedTotal);
        assertEquals(Math.sqrt(n) / s, br.statOnly(), 1e-7 * expectedTotal);
        Map<String, Double> byName = new LinkedHashMap<>();
        for (Impacts.Contribution c : br.groups()) byName.put(c.group(), c.contribution());
        assertEquals(Math.hypot(effects[0], effects[1]) / s, byName.get("detector"), 1e-7 * expectedTotal);
        assertEquals(effects[2] / s, byName.get("theory"), 1e-7 * expectedTotal);
        assertEquals(effects[3] / s, byName.get("other"), 1e-7 * expectedTotal);
        assertEquals(delta * b2 / s, byName.get(Impacts.MC_STATISTICS), 1e-7 * expectedTotal);

        double sum = br.statOnly() * br.statOnly();
        for (String g : List.of("detector", "theory", "other", Impacts.MC_STATISTICS)) sum += byName.get(g) * byName.get(g);
        assertEquals(br.total() * br.total(), sum, 1e-10 * br.total() * br.total());
        double all = byName.get(Impacts.ALL_SYSTEMATICS);
        assertEquals(br.total() * br.total(), br.statOnly() * br.statOnly() + all * all, 1e-10 * br.total() * br.total());
    }
}
