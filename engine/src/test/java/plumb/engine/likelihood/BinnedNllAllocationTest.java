package plumb.engine.likelihood;

import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.ModelOptions;

import plumb.engine.ThreadAllocation;

import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Evaluating −ln L, its gradient and its Hessian allocates nothing: the work arrays live in the
 * likelihood object. Measured with the JVM's per-thread allocation counter over many evaluations,
 * in both layouts of the MC-statistics parameters.
 */
class BinnedNllAllocationTest {


    @Test
    void evaluationsDoNotAllocate() {
        CompiledModel m = ModelCompiler.compile(TestModels.mixed(5, ModelOptions.McStatConstraint.GAUSSIAN));
        for (boolean explicit : new boolean[] {false, true}) {
            BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
            int n = nll.dimension();
            double[] x = java.util.Arrays.copyOf(m.nominal(), n);
            x[m.poi()] = 1.3;
            double[] g = new double[n], h = new double[n * n];
            Runnable evaluations = () -> {
                for (int k = 0; k < 2000; k++) {
                    x[0] += 1e-9;
                    nll.value(x);
                    nll.valueAndGradient(x, g);
                    nll.valueGradientHessian(x, g, h);
                }
            };
            evaluations.run(); // let the JIT settle first
            long bytes = ThreadAllocation.bytesAllocatedBy(evaluations);
            // 6000 evaluations; 256 bytes of slack for the counter itself
            assertTrue(bytes < 256, (explicit ? "explicit" : "profiled") + " layout allocated " + bytes + " bytes");
        }
    }
}
