package plumb.engine.tooling;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ParameterSpec;
import org.apache.commons.math3.special.Gamma;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Combining models: one parameter per name, renames, refusals naming both sources, and −ln L adding up. */
class CombinationTest {

    /** The mixed test model with its channels renamed so that two of them can be combined. */
    private static Model part(long seed, String prefix) {
        Model m = TestModels.mixed(seed, ModelOptions.McStatConstraint.GAUSSIAN);
        List<Channel> channels = new ArrayList<>();
        for (Channel ch : m.channels()) channels.add(new Channel(prefix + ch.name(), ch.observable(), ch.edges(), ch.observed(), ch.samples()));
        return new Model(m.format(), prefix + "model", null, m.poi(), channels, m.parameters(), Map.of("syst", List.of("lumi")),
                Map.of("mass", 1500.0), m.options());
    }

    /**
     * −ln L of the combination equals the sum of the parts' at the same parameter values, less the
     * constraint terms of the shared constrained parameters, which the combination counts once
     * (docs/model-format.md, Likelihood: one constraint term per parameter). The bin terms and
     * the per-bin MC-statistics terms are independent per channel, so the sum is exact up to
     * rounding: 1e-12 relative.
     */
    @Test
    void theCombinedLikelihoodIsTheSumOfItsParts() {
        Model a = part(1, "a_"), b = part(2, "b_");
        Model ab = Combination.combine(List.of(new Combination.Part(a, "A.json", Map.of()),
                new Combination.Part(b, "B.json", Map.of("eff", "eff_b"))), null);
        assertEquals("a_model+b_model", ab.name());
        CompiledModel mc = ModelCompiler.compile(ab), ma = ModelCompiler.compile(a), mb = ModelCompiler.compile(b);
        assertTrue(mc.indexOf("eff") >= 0 && mc.indexOf("eff_b") >= 0, "the renamed parameter is a parameter of its own");
        Random r = new Random(3);
        for (int trial = 0; trial < 5; trial++) {
            double[] x = mc.nominal();
            for (int i = 0; i < mc.nParams(); i++) x[i] += 0.3 * (r.nextDouble() - 0.5);
            double[] xa = values(ma, mc, x, Map.of()), xb = values(mb, mc, x, Map.of("eff", "eff_b"));
            double combined = new BinnedNll(mc, DataSet.observed(mc)).value(java.util.Arrays.copyOf(x, mc.nParams()));
            double sum = new BinnedNll(ma, DataSet.observed(ma)).value(xa) + new BinnedNll(mb, DataSet.observed(mb)).value(xb);
            for (int i = 0; i < ma.nParams(); i++) {
                if (mb.indexOf(ma.parameterNames(i)) >= 0 && !ma.parameterNames(i).equals("eff")) sum -= constraintTerm(ma, i, xa[i]);
            }
            assertEquals(sum, combined, 1e-12 * Math.abs(combined), "trial " + trial);
        }
    }

    /** A part's parameter values taken by name from the combination's ({@code renamed}: part name to combined name). */
    private static double[] values(CompiledModel part, CompiledModel combined, double[] x, Map<String, String> renamed) {
        double[] out = new double[part.nParams()];
        for (int i = 0; i < part.nParams(); i++) {
            String n = part.parameterNames(i);
            out[i] = x[combined.indexOf(renamed.getOrDefault(n, n))];
        }
        return out;
    }

    /** The constraint term of docs/model-format.md, constants included. */
    private static double constraintTerm(CompiledModel m, int i, double theta) {
        if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
            double w = m.width(i), d = theta - m.auxNominal(i);
            return d * d / (2 * w * w) + Math.log(w * Math.sqrt(2 * Math.PI));
        }
        if (m.constraintType(i) == ConstraintType.POISSON) {
            double tau = m.tau(i), aux = m.auxNominal(i);
            return tau * theta - aux * Math.log(tau * theta) + Gamma.logGamma(aux + 1);
        }
        return 0;
    }

    @Test
    void groupsAndLabelsMerge() {
        Model a = part(1, "a_"), b = part(2, "b_");
        Model bWithGroup = new Model(b.format(), b.name(), null, b.poi(), b.channels(), b.parameters(),
                Map.of("syst", List.of("lumi", "scale"), "other", List.of("aux")), Map.of("mass", 1500.0, "run", "two"), b.options());
        Model ab = Combination.combine(List.of(new Combination.Part(a, "A.json", null), new Combination.Part(bWithGroup, "B.json", null)), "ab");
        assertEquals(List.of("lumi", "scale"), ab.groups().get("syst"));
        assertEquals(List.of("aux"), ab.groups().get("other"));
        assertEquals("two", ab.labels().get("run"));
    }

    @Test
    void conflictsAreRefusedNamingBothSources() {
        Model a = part(1, "a_"), b = part(2, "b_");
        ModelException e = assertThrows(ModelException.class, () -> Combination.combine(List.of(
                new Combination.Part(a, "A.json", null), new Combination.Part(a, "A2.json", null)), null));
        assertEquals("channel \"a_ch0\" is in both A.json and A2.json (rename it in one of them)", e.getMessage());
        Model bOtherMu = new Model(b.format(), b.name(), null, b.poi(), b.channels(),
                List.of(b.parameters().get(0), new ParameterSpec("mu", null, new double[] {-5, 10}, null, null, false)),
                Map.of(), Map.of(), b.options());
        e = assertThrows(ModelException.class, () -> Combination.combine(List.of(
                new Combination.Part(a, "A.json", null), new Combination.Part(bOtherMu, "B.json", null)), null));
        assertEquals("parameter \"mu\" has different settings in A.json and B.json", e.getMessage());
        e = assertThrows(ModelException.class, () -> Combination.combine(List.of(
                new Combination.Part(a, "A.json", null), new Combination.Part(b, "B.json", Map.of("mu", "mu_b"))), null));
        assertTrue(e.getMessage().startsWith("different POIs: \"mu\" in A.json, \"mu_b\" in B.json"), e.getMessage());
        e = assertThrows(ModelException.class, () -> Combination.combine(List.of(
                new Combination.Part(a, "A.json", null), new Combination.Part(b, "B.json", Map.of("lumi", "k0"))), null));
        assertEquals("parameter \"k0\" is a free factor in A.json but a constrained (variation) parameter in B.json", e.getMessage());
        e = assertThrows(ModelException.class, () -> Combination.combine(List.of(
                new Combination.Part(a, "A.json", null), new Combination.Part(b, "B.json", Map.of("nope", "x"))), null));
        assertEquals("B.json has no parameter \"nope\" to rename", e.getMessage());
    }
}
