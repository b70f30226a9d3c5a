package plumb.engine.model;

import com.code_intelligence.jazzer.junit.FuzzTest;
import org.junit.jupiter.api.condition.DisabledIfSystemProperty;
import org.junit.jupiter.api.condition.EnabledIfSystemProperty;

/**
 * Coverage-guided fuzzing of the model reader and validator with Jazzer: no input may give
 * anything but a valid model or a one-line {@link ModelException} ({@link ModelReaderFuzzTest#check}).
 *
 * <p>In the ordinary test run (surefire's default execution skips this class) nothing happens;
 * the engine's {@code fuzz-model-reader} execution runs it with JAZZER_FUZZ=1: ten seconds of
 * fuzzing from the seed inputs in {@code ModelReaderJazzerTestInputs/readerAndValidator/}.
 * {@code -Dplumb.fuzz.long=true} fuzzes for up to 30 minutes instead. An input that breaks the
 * property is saved by Jazzer beside the seeds (a crash-* file) and replayed by every later run.
 */
class ModelReaderJazzerTest {

    @DisabledIfSystemProperty(named = "plumb.fuzz.long", matches = "true")
    @FuzzTest(maxDuration = "10s")
    void readerAndValidator(byte[] input) {
        ModelReaderFuzzTest.check(input);
    }

    @EnabledIfSystemProperty(named = "plumb.fuzz.long", matches = "true")
    @FuzzTest(maxDuration = "30m")
    void readerAndValidatorLong(byte[] input) {
        ModelReaderFuzzTest.check(input);
    }
}
