package plumb.engine.tooling;

import org.junit.jupiter.api.Test;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Whole-model tidying: the operations in their order, the change log, a valid result. */
class TidyTest {

    private static Model model() {
        double[] n = {100, 50, 20, 10};
        List<Variation> vars = List.of(
                new Variation("tiny", new Variation.NormEffect(0.999, 1.0005), null, null, null),
                new Variation("onesided", new Variation.NormEffect(1.02, 1.06), null, null, null),
                new Variation("flat", null, new Variation.ShapeEffect(
                        new double[] {95, 47.5, 19, 9.5}, new double[] {110, 55, 22, 11}), null, null),
                new Variation("none", new Variation.NormEffect(1, 1), null, null, null),
                new Variation("mu", new Variation.NormEffect(1.0001, 1.0001), null, null, null));
        Sample s = new Sample("bkg", n, null, List.of("k"), vars);
        Channel ch = new Channel("sr", null, null, new double[] {98, 52, 21, 9}, List.of(s));
        List<ParameterSpec> params = List.of(new ParameterSpec("tiny", null, new double[] {-3, 3}, null, null, false));
        return new Model(Model.FORMAT, "tidy", null, "mu", List.of(ch), params,
                Map.of("syst", List.of("tiny", "onesided")), Map.of(), ModelOptions.DEFAULTS);
    }

    @Test
    void nothingAskedNothingChanged() {
        Tidy.Result r = Tidy.apply(model(), TidyOptions.NONE);
        assertTrue(r.changes().isEmpty(), r.changes().toString());
        assertEquals(ModelWriter.toJson(model()), ModelWriter.toJson(r.model()));
    }

    @Test
    void everyOperationLogsWhatItChanged() {
        TidyOptions all = new TidyOptions(true, Symmetrisation.LARGER, 1e-9, 0.002, 0.002, true);
        Tidy.Result r = Tidy.apply(model(), all);
        List<Variation> vars = r.model().channels().get(0).samples().get(0).variations();
        assertEquals(List.of("onesided", "flat", "mu"), vars.stream().map(Variation::parameter).toList());
        assertEquals(0.94, vars.get(0).norm().down(), 1e-15);
        assertEquals(1.1, vars.get(1).norm().up(), 1e-14);
        assertEquals(0.95, vars.get(1).norm().down(), 1e-14);
        assertEquals(1.0001, vars.get(2).norm().up(), 0);     // the POI is never edited
        assertTrue(r.model().parameters().isEmpty());          // tiny's entry went with its variation
        assertEquals(List.of("onesided"), r.model().groups().get("syst"));
        String log = String.join("\n", r.changes());
        assertEquals(6, r.changes().size(), log);
        assertTrue(log.contains("sr/bkg/tiny: pruned norm part"), log);
        assertTrue(log.contains("sr/bkg/onesided: norm made two-sided (larger)"), log);
        assertTrue(log.contains("sr/bkg/flat: shape is a pure normalisation"), log);
        assertTrue(log.contains("sr/bkg/none: pruned norm part (largest effect 0.00 < 0.00200); variation removed"), log);
        assertTrue(log.contains("parameters/tiny: no variation left"), log);
        assertTrue(log.contains("groups/syst: tiny has no variation left"), log);
    }

    @Test
    void dropUnusedAloneRemovesVariationsWithoutEffect() {
        Tidy.Result r = Tidy.apply(model(), new TidyOptions(false, null, null, null, null, true));
        assertEquals(List.of("sr/bkg/none: no effect on any yield; variation removed"), r.changes());
        assertEquals(4, r.model().channels().get(0).samples().get(0).variations().size());
    }
}
