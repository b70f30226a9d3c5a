package plumb.engine.compile;

import org.junit.jupiter.api.Test;
import plumb.engine.model.ModelReader;

import java.lang.reflect.Field;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A what-if variant starts from {@code toBuilder()}: it must carry every field of the model. */
class ToBuilderTest {

    private static CompiledModel oneSidedModel() {
        String json = """
                {"format": "plumb-model/1", "name": "variant", "channels": [{"name": "bin", "samples": [
                  {"name": "bkg", "yields": [100, 80], "variations": [{"parameter": "theta",
                    "norm": {"down": 1.25, "up": 1.35}}]}],
                  "observed": [125, 90]}]}
                """;
        return ModelCompiler.compile(ModelReader.parse(json, "variant.json"));
    }

    @Test
    void everyBuilderFieldIsCarriedOver() throws ReflectiveOperationException {
        CompiledModel m = oneSidedModel();
        CompiledModel.Builder b = m.toBuilder();
        int checked = 0;
        for (Field f : CompiledModel.Builder.class.getDeclaredFields()) {
            if (f.isSynthetic()) continue; // the builder holds instance fields only
            Object value = f.get(b);
            Object original = CompiledModel.class.getDeclaredField(f.getName()).get(m);
            if (f.getType().isPrimitive()) assertEquals(original, value, f.getName());
            else {
                assertNotNull(value, f.getName());
                assertSame(original, value, f.getName());
            }
            checked++;
        }
        assertEquals(46, checked, "fields of the builder");
    }

    @Test
    void aVariantKeepsTheOneSidedFlag() {
        CompiledModel m = oneSidedModel();
        assertTrue(m.oneSided(0));
        assertTrue(ModelVariants.yieldsScaled(m, 2).oneSided(0));
        assertTrue(ModelVariants.constraintsScaled(m, new int[] {0}, 2).oneSided(0));
    }
}
