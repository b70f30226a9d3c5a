package plumb.engine.minimise;

import static org.junit.jupiter.api.Assertions.assertTrue;

import plumb.engine.ThreadAllocation;
import java.util.Arrays;
import org.junit.jupiter.api.Test;
import plumb.engine.minimise.TestObjectives.Rosenbrock;

/**
 * The iterations allocate nothing: the bytes a fit allocates (validation and result copies) do
 * not grow with the number of iterations. Measured with the JVM's per-thread allocation counter.
 */
class AllocationTest {


    @Test
    void newtonIterationsDoNotAllocate() {
        int n = 10;
        Rosenbrock f = new Rosenbrock(n);
        BoundedNewton newton = new BoundedNewton(n);
        double[] lower = new double[n];
        double[] upper = new double[n];
        Arrays.fill(lower, -5);
        Arrays.fill(upper, 5);
        double[] near = new double[n];
        Arrays.fill(near, 0.999);
        double[] far = new double[n];
        int[] iterations = new int[2];
        for (int warm = 0; warm < 200; warm++) { // let the JIT settle first
            newton.minimise(f, far, lower, upper);
        }
        long few = ThreadAllocation.bytesAllocatedBy(() -> iterations[0] = newton.minimise(f, near, lower, upper).iterations());
        long many = ThreadAllocation.bytesAllocatedBy(() -> iterations[1] = newton.minimise(f, far, lower, upper).iterations());
        assertTrue(iterations[1] > iterations[0] + 10, Arrays.toString(iterations));
        // Same validation and result copies in both fits; 256 bytes of slack for the counter itself.
        assertTrue(Math.abs(many - few) < 256, few + " vs " + many + " bytes");
    }
}
