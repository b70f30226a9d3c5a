package plumb.engine.compile;

import org.junit.jupiter.api.Test;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** {@code options.pruneBelow} (docs/model-format.md, Options). */
class PruningTest {

    private static Model model(double pruneBelow) {
        double[] n = {100, 50, 0};
        List<Variation> vars = List.of(
                // norm 0.5 % (pruned at 1 %), shape largest 2 % (kept)
                new Variation("a", new Variation.NormEffect(0.995, 1.004), new Variation.ShapeEffect(
                        new double[] {99, 49, 3}, new double[] {102, 50.5, 0}), null, null),
                // norm 3 % (kept); shape 0.2 % (pruned); the bin with n = 0 does not count
                new Variation("b", new Variation.NormEffect(0.97, 1.03), new Variation.ShapeEffect(
                        new double[] {99.8, 50, 7}, new double[] {100.2, 50, 9}), null, null),
                // both parts negligible: the parameter keeps its constraint and acts on nothing
                new Variation("c", new Variation.NormEffect(0.999, 1.001), null, null, null));
        Sample s = new Sample("bkg", n, null, List.of(), vars);
        Channel ch = new Channel("sr", null, null, new double[] {98, 52, 1}, List.of(s));
        return new Model(Model.FORMAT, "prune", null, null, List.of(ch), List.of(), Map.of(), Map.of(),
                new ModelOptions(0, ModelOptions.McStatConstraint.GAUSSIAN, pruneBelow));
    }

    @Test
    void dropsNegligiblePartsAndReportsThem() {
        CompiledModel m = ModelCompiler.compile(model(0.01));
        assertEquals(3, m.pruned.size(), String.join("\n", m.pruned));
        assertTrue(m.pruned.get(0).contains("norm part of a"), m.pruned.get(0));
        assertTrue(m.pruned.get(1).contains("shape part of b"), m.pruned.get(1));
        assertTrue(m.pruned.get(2).contains("norm part of c"), m.pruned.get(2));
        assertEquals(1, m.shapeParam.length);            // a's shape
        assertEquals(m.indexOf("a"), m.shapeParam[0]);
        assertEquals(1, m.mulParam.length);              // b's norm
        assertEquals(m.indexOf("b"), m.mulParam[0]);
        int c = m.indexOf("c");
        assertEquals(ConstraintType.GAUSSIAN, m.constraintType[c]); // still a constrained parameter
        assertEquals(1, m.width[c]);
    }

    @Test
    void keepsEverythingByDefault() {
        CompiledModel m = ModelCompiler.compile(model(0));
        assertEquals(0, m.pruned.size());
        assertEquals(2, m.shapeParam.length);
        assertEquals(3, m.mulParam.length);
    }
}
