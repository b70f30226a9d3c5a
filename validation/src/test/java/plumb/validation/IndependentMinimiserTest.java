package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;
import plumb.models.DemoModel;
import plumb.models.SyntheticModels;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The Newton fit against an independent derivative-free minimiser (commons-math 3.6.1 BOBYQA) on
 * the demo model and on generated models: the same minimum −ln L to 1e-6 and the same best-fit
 * values to 1e-4 (references.md item 11).
 */
class IndependentMinimiserTest {

    private static Model model(String name) {
        return switch (name) {
            case "demo" -> DemoModel.load();
            case "small" -> SyntheticModels.generate(2, 12, 3, 8, 7);
            case "small-2" -> SyntheticModels.generate(3, 10, 4, 12, 8);
            default -> throw new IllegalArgumentException(name);
        };
    }

    @ParameterizedTest
    @ValueSource(strings = {"demo", "small", "small-2"})
    void newtonAndBobyqaReachTheSameMinimum(String name) {
        CompiledModel m = ModelCompiler.compile(model(name));
        DataSet d = DataSet.observed(m);
        FitResult newton = new Fitter(m, d, FitSettings.defaults()).fit();
        FitResult bobyqa = new Fitter(m, d, FitSettings.defaults().withMinimiser(FitSettings.MinimiserKind.REFERENCE)).fit();
        assertTrue(newton.converged(), newton.status().toString());
        assertEquals(bobyqa.nll(), newton.nll(), 1e-6);
        for (int i = 0; i < m.nParams(); i++) {
            assertEquals(bobyqa.values()[i], newton.values()[i], 1e-4 * Math.max(1, Math.abs(newton.values()[i])),
                    m.parameterNames(i));
        }
    }
}
