package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.Covariances;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ParameterKind;
import plumb.models.SyntheticModels;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The block form of the post-fit covariance (Schur complement of the diagonal γ block; the
 * inverse of a partitioned matrix, common practice) against the dense inverse of the full
 * Hessian over all parameters, on the medium generated model: every entry, and the conditional
 * variances of the POI behind the grouped breakdown (Σ_tt − Σ_tG Σ_GG⁻¹ Σ_Gt from the dense
 * matrix against (H_FF⁻¹)_tt from the blocks).
 */
class PostfitCovarianceTest {

    /**
     * 0: nothing held beyond the model; 1: a nuisance parameter and an MC-statistics γ held as
     * well; 2: the explicit layout (γ among the fit's variables).
     */
    @ParameterizedTest
    @ValueSource(ints = {0, 1, 2})
    void blockFormEqualsTheDenseInverse(int variant) {
        CompiledModel m = ModelCompiler.compile(SyntheticModels.medium(1));
        int[] held = new int[0];
        double[] heldValues = new double[0];
        if (variant == 1) {
            int theta = firstOfKind(m, ParameterKind.VARIATION, 3), gamma = firstOfKind(m, ParameterKind.MC_STATISTICS, 17);
            held = new int[] {theta, gamma};
            heldValues = new double[] {0.2, 1.01};
        }
        FitSettings settings = variant == 2 ? FitSettings.defaults().withExplicitGamma(true) : FitSettings.defaults();
        Fitter fitter = new Fitter(m, DataSet.observed(m), settings, held, heldValues);
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        double[] dense = Covariances.full(fitter.likelihood(), best);
        PostfitCovariance block = PostfitCovariance.of(fitter.likelihood(), best);
        assertNotNull(dense);
        assertNotNull(block);
        int n = m.nAll();
        assertTrue(m.nGamma() >= 100, "the comparison covers many γ");
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double scale = Math.sqrt(Math.abs(dense[i * n + i] * dense[j * n + j]));
                assertEquals(dense[i * n + j], block.covariance(i, j), 1e-10 * scale + 1e-300,
                        m.parameterNames(i) + "," + m.parameterNames(j));
            }
        }
        if (variant == 1) {
            assertEquals(0, block.variance(held[1]));
            assertEquals(0, block.covariance(m.poi(), held[0]));
        }
        // conditional variances of the POI: the model's groups, all γ, all constrained, a mixed set
        List<int[]> sets = new ArrayList<>();
        for (int[] g : m.groupMembers()) sets.add(withoutHeld(g, best, m.poi()));
        List<Integer> gammas = new ArrayList<>(), constrained = new ArrayList<>(), mixed = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            if (i == m.poi() || best.held()[i] || !m.constrained(i)) continue;
            constrained.add(i);
            if (m.kind(i) == ParameterKind.MC_STATISTICS) gammas.add(i);
            if (i % 3 == 0) mixed.add(i);
        }
        sets.add(gammas.stream().mapToInt(Integer::intValue).toArray());
        sets.add(constrained.stream().mapToInt(Integer::intValue).toArray());
        sets.add(mixed.stream().mapToInt(Integer::intValue).toArray());
        double total = dense[m.poi() * n + m.poi()];
        for (int[] set : sets) {
            double expected = Covariances.conditionalVariance(dense, n, m.poi(), set);
            double got = block.conditionalVariance(m.poi(), set);
            assertTrue(expected > 0 && expected < total, "a real reduction: " + expected + " of " + total);
            assertEquals(expected, got, 1e-10 * total, set.length + " parameters held");
        }
    }

    private static int firstOfKind(CompiledModel m, ParameterKind kind, int skip) {
        for (int i = 0; i < m.nAll(); i++) {
            if (m.kind(i) == kind && !m.fixed(i) && skip-- == 0) return i;
        }
        throw new AssertionError("no parameter of kind " + kind);
    }

    private static int[] withoutHeld(int[] members, FitResult best, int poi) {
        return java.util.Arrays.stream(members).filter(i -> i != poi && !best.held()[i]).toArray();
    }
}
