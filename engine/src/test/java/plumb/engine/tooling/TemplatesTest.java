package plumb.engine.tooling;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.model.ModelOptions;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/** Templates at θ = ±1 as docs/model-format.md defines the expectation there: shape yields times κ. */
class TemplatesTest {

    @Test
    void oneTemplatePerVariationWithShapeTimesKappa() {
        var model = TestModels.mixed(1, ModelOptions.McStatConstraint.GAUSSIAN);
        var all = Templates.of(model);
        assertEquals(16, all.size());   // 3 + 3 + 2 variations in each of the two channels
        var shapeB = all.stream().filter(t -> t.channel().equals("ch0") && t.parameter().equals("shapeB")).findFirst().orElseThrow();
        var v = model.channels().get(0).samples().get(1).variations().get(1);
        double[] up = v.shape().up().clone();
        for (int b = 0; b < up.length; b++) up[b] *= 1.07;
        assertArrayEquals(up, shapeB.up(), 0);
        var lumi = all.get(0);
        double[] n = model.channels().get(0).samples().get(0).yields();
        for (int b = 0; b < n.length; b++) assertEquals(0.97 * n[b], lumi.down()[b], 0);
    }
}
