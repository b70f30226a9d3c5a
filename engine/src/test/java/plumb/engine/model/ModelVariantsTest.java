package plumb.engine.model;

import org.junit.jupiter.api.Test;
import plumb.engine.inference.DataSets;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.compile.ModelVariants;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** What-if variants: yields scaled with the luminosity, constraint widths scaled. */
class ModelVariantsTest {

    private final CompiledModel m = ModelCompiler.compile(ModelReader.parse(ModelJsonFixtures.BASE, "base.json"));

    /**
     * Every term of the expectation is a yield times relative factors (docs/model-format.md), so
     * scaling the yields by L scales every bin's expectation by L at any parameter values.
     */
    @Test
    void scaledYieldsScaleEveryExpectation() {
        CompiledModel scaled = ModelVariants.yieldsScaled(m, 3.7);
        Random rnd = new Random(5);
        for (int trial = 0; trial < 5; trial++) {
            double[] values = m.nominal();
            for (int i = 0; i < m.nAll(); i++) {
                values[i] = Math.max(m.lower(i), Math.min(m.upper(i), values[i] + 0.6 * rnd.nextGaussian()));
            }
            double[] a = DataSets.expectedCounts(m, values), b = DataSets.expectedCounts(scaled, values);
            for (int bin = 0; bin < m.nBins(); bin++) assertEquals(3.7 * a[bin], b[bin], 1e-12 * Math.abs(b[bin]) + 1e-300);
        }
    }

    /** A variant carries every field of the model (a field added to the model but not to the copy would be null). */
    @Test
    void variantsCopyEveryField() throws IllegalAccessException {
        CompiledModel copy = ModelVariants.constraintsScaled(m, new int[0], 1.0);
        for (java.lang.reflect.Field f : CompiledModel.class.getFields()) {
            if (f.getDeclaringClass() != CompiledModel.class || isClassConstant(f)) continue;
            Object a = f.get(m), b = f.get(copy);
            if (a == null) continue;
            assertEquals(a.getClass(), b == null ? null : b.getClass(), f.getName());
            if (!a.getClass().isArray()) assertEquals(a, b, f.getName());
        }
    }

    @Test
    void scaledConstraintsChangeOnlyTheNamedWidths() {
        int[] some = {m.indexOf("bkgNorm"), m.indexOf("lumi")};
        CompiledModel scaled = ModelVariants.constraintsScaled(m, some, 0.5);
        for (int i = 0; i < m.nAll(); i++) {
            boolean named = i == some[0] || i == some[1];
            if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
                assertEquals(named ? 0.5 * m.width(i) : m.width(i), scaled.width(i), 0);
                assertEquals(named ? 0.5 * m.prefitWidth(i) : m.prefitWidth(i), scaled.prefitWidth(i), 0);
            } else if (m.constraintType(i) == ConstraintType.POISSON) {
                assertEquals(named ? 4 * m.tau(i) : m.tau(i), scaled.tau(i), 1e-12 * m.tau(i));
            }
        }
    }

    /** A constant of the class rather than a field of each model: reading it without an instance works. */
    private static boolean isClassConstant(java.lang.reflect.Field f) {
        try {
            f.get(null);
            return true;
        } catch (NullPointerException | IllegalAccessException e) {
            return false;
        }
    }
}
