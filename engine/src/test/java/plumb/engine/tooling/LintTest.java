package plumb.engine.tooling;

import org.junit.jupiter.api.Test;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** One model with one case of every lint warning, and a clean model with none. */
class LintTest {

    private static final double[] N = {100, 50, 20, 0};

    @Test
    void everyWarningOnce() {
        List<Variation> vars = List.of(
                new Variation("dead", new Variation.NormEffect(1, 1), null, null, null),
                new Variation("small", new Variation.NormEffect(0.9995, 1.0008), null, null, null),
                new Variation("flat", null, new Variation.ShapeEffect(
                        new double[] {95, 47.5, 19, 0}, new double[] {104, 52, 20.8, 0}), null, null),
                new Variation("fine", new Variation.NormEffect(0.95, 1.05), null, null, null));
        Sample bkg = new Sample("bkg", N, new double[] {5, 3, 11, 0}, List.of("k"), vars);
        Sample empty = new Sample("empty", new double[4], null, List.of(), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {98, 52, 21, 3}, List.of(bkg, empty));
        Model m = new Model(Model.FORMAT, "lint", null, null, List.of(ch), List.of(),
                Map.of("syst", List.of("fine")), Map.of(), ModelOptions.DEFAULTS);
        assertEquals(List.of(
                "sr/bkg/small: moves no yield by 0.1 % or more (prunable: tidy --prune-norm/--prune-shape 0.001)",
                "sr/bkg/flat: shape with a flat ratio to nominal: a normalisation only (tidy --split-norm)",
                "sr/empty: every yield is 0",
                "sr bin 3: 3 observed but no sample expects anything",
                "sr bin 2: MC-statistics error is 55 % of the yield",
                "parameter dead: none of its variations moves any yield (unused)",
                "groups: 3 parameters in no group: dead, small, flat"), Lint.warnings(m));
    }

    @Test
    void aCleanModelHasNoWarnings() {
        Sample bkg = new Sample("bkg", new double[] {100, 50}, new double[] {5, 4}, List.of("k"),
                List.of(new Variation("a", new Variation.NormEffect(0.95, 1.05), null, null, null)));
        Channel ch = new Channel("sr", null, null, new double[] {98, 52}, List.of(bkg));
        Model m = new Model(Model.FORMAT, "clean", null, null, List.of(ch), List.of(),
                Map.of("all", List.of("a")), Map.of(), ModelOptions.DEFAULTS);
        assertEquals(List.of(), Lint.warnings(m));
    }
}
