package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.models.DemoModel;
import plumb.models.SyntheticModels;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Per-bin MC-statistics parameters solved in closed form inside every evaluation give the same
 * fit as minimising them as ordinary parameters: minimum, values and errors (references.md
 * item 9: J. S. Conway, arXiv:1103.0354; R. Barlow, C. Beeston, CPC 77 (1993) 219), with the
 * Gaussian and the Poisson constraint forms.
 */
class ClosedFormMcStatTest {

    private static Model model(String name, ModelOptions.McStatConstraint form) {
        Model m = name.equals("demo") ? DemoModel.load() : SyntheticModels.generate(2, 15, 4, 10, 3);
        return new Model(m.format(), m.name(), m.description(), m.poi(), m.channels(), m.parameters(), m.groups(),
                m.labels(), new ModelOptions(m.options().mcStatThreshold(), form, m.options().pruneBelow()));
    }

    @ParameterizedTest
    @CsvSource({"demo,GAUSSIAN", "demo,POISSON", "generated,GAUSSIAN", "generated,POISSON"})
    void closedFormEqualsExplicit(String name, ModelOptions.McStatConstraint form) {
        CompiledModel m = ModelCompiler.compile(model(name, form));
        DataSet d = DataSet.observed(m);
        FitResult closed = new Fitter(m, d, FitSettings.defaults()).fit();
        FitResult explicit = new Fitter(m, d, FitSettings.defaults().withExplicitGamma(true)).fit();
        assertTrue(closed.converged() && explicit.converged(), closed.status() + " " + explicit.status());
        // both stop at Newton decrement < 1e-8: the minima agree to well below 1e-8
        assertEquals(explicit.nll(), closed.nll(), 1e-8);
        for (int i = 0; i < m.nAll(); i++) {
            double err = explicit.errors()[i];
            // values: each fit is within 1e-4 of an error of the true minimum
            assertEquals(explicit.values()[i], closed.values()[i], 2e-4 * err, m.parameterNames(i));
            // errors: Schur complement / block inverse against the full inverse Hessian, at points 1e-4 σ apart
            assertEquals(err, closed.errors()[i], 1e-3 * err, m.parameterNames(i));
        }
    }
}
