package plumb.validation;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.ProfileScan;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;
import plumb.models.DemoModel;
import plumb.models.SyntheticModels;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A profile point is the minimum of −ln L with the parameter held, so it must equal a fit from
 * scratch with that parameter held (the definition of the profile likelihood, common practice):
 * a warm-started point that lies above the fresh fit is stuck in a worse basin. Checked on the
 * demo model and on generated models, for the POI and for the nuisance parameter with the largest
 * pull, over ±3 errors around the best fit.
 */
class ProfileConsistencyTest {

    private static final int[] NONE = new int[0];
    private static final double[] NO_VALUES = new double[0];

    static Model model(String name) {
        return switch (name) {
            case "demo" -> DemoModel.load();
            case "small-1" -> SyntheticModels.generate(2, 12, 4, 10, 1);
            case "small-2" -> SyntheticModels.generate(3, 8, 5, 14, 2);
            case "small-3" -> SyntheticModels.generate(1, 20, 3, 6, 3);
            case "medium" -> SyntheticModels.medium(1);
            default -> throw new IllegalArgumentException(name);
        };
    }

    @ParameterizedTest
    @ValueSource(strings = {"demo", "small-1", "small-2", "small-3", "medium"})
    void everyProfilePointEqualsAFreshFit(String name) {
        CompiledModel m = ModelCompiler.compile(model(name));
        DataSet data = DataSet.observed(m);
        FitSettings s = FitSettings.defaults();
        Fitter fitter = new Fitter(m, data, s);
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        ProfileScan scan = new ProfileScan(m, data, s, NONE, NO_VALUES, best);
        for (int k : new int[] {m.poi(), mostPulled(m, best)}) {
            double v = best.values()[k], e = best.errors()[k];
            List<ProfileScan.Point> points = scan.points(k, v - 3 * e, v + 3 * e, 9, 2, null);
            for (ProfileScan.Point p : points) {
                FitResult fresh = fitter.fit(fitter.nominalStart(), k, p.value());
                assertTrue(fresh.converged(), m.parameterNames(k) + " = " + p.value() + ": " + fresh.status());
                // 1e-6 in −ln L: the fits themselves settle to ~1e-9
                assertEquals(fresh.nll(), p.nll(), 1e-6, name + ": " + m.parameterNames(k) + " = " + p.value());
            }
        }
    }

    private static int mostPulled(CompiledModel m, FitResult best) {
        int out = -1;
        double largest = -1;
        for (int i = 0; i < m.nParams(); i++) {
            if (!m.constrained(i) || best.held()[i]) continue;
            double pull = Math.abs(best.values()[i] - m.nominal(i)) / m.prefitWidth(i);
            if (pull > largest) {
                largest = pull;
                out = i;
            }
        }
        return out;
    }
}
