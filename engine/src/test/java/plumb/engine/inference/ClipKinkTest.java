package plumb.engine.inference;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.likelihood.DataSet;
import plumb.engine.minimise.MinimumStatus;
import plumb.engine.model.Channel;
import plumb.engine.model.Interpolation;
import plumb.engine.model.Model;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A minimum on the kink of max(0, ·) (docs/model-format.md): recognised, and the same as BOBYQA's. */
class ClipKinkTest {

    /**
     * One shape parameter θ: bin 0 grows as 1 + 2θ, bin 1's sample falls as 4 − 4θ and is clipped
     * beyond θ = 1. With n = (12, 5) over a flat 10 per bin, the slope of −ln L is −0.85 just left
     * of θ = 1 and +1.15 just right of it (worked by hand from the Poisson terms and the unit
     * Gaussian constraint): the minimum is the kink θ = 1.
     */
    private static Model kinkModel() {
        Variation v = new Variation("theta", null,
                new Variation.ShapeEffect(new double[] {0, 8}, new double[] {3, 0}), null, Interpolation.LINEAR);
        Sample moving = new Sample("moving", new double[] {1, 4}, null, List.of(), List.of(v));
        Sample flat = new Sample("flat", new double[] {10, 10}, null, List.of(), List.of());
        Channel ch = new Channel("sr", null, null, new double[] {12, 5}, List.of(moving, flat));
        return new Model(Model.FORMAT, "kink", null, null, List.of(ch), List.of(), Map.of(), Map.of(), null);
    }

    @Test
    void minimumOnTheClipKinkIsRecognised() {
        CompiledModel m = ModelCompiler.compile(kinkModel());
        DataSet d = DataSet.observed(m);
        FitResult newton = new Fitter(m, d, FitSettings.defaults()).fit();
        assertEquals(MinimumStatus.CONVERGED_AT_KINK, newton.status());
        assertEquals(1.0, newton.values()[m.indexOf("theta")], 1e-7);
        // references.md item 11: an independent derivative-free minimiser finds the same minimum
        FitResult reference = new Fitter(m, d, FitSettings.defaults().withMinimiser(FitSettings.MinimiserKind.REFERENCE)).fit();
        assertTrue(newton.nll() <= reference.nll() + 1e-9, newton.nll() + " vs " + reference.nll());
        assertEquals(reference.values()[m.indexOf("theta")], newton.values()[m.indexOf("theta")], 1e-4);
    }
}
