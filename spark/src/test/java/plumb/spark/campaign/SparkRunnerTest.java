package plumb.spark.campaign;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.RangeWork;
import plumb.engine.inference.WorkRunner;
import plumb.models.DemoModel;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/** The runner in embedded local[2]: results by index, the model from the broadcast bytes. */
class SparkRunnerTest {

    static SparkRunner spark;
    static CompiledModel model;

    @BeforeAll
    static void start() {
        spark = SparkRunner.open("local[2]", 120);
        model = ModelCompiler.compile(DemoModel.load());
    }

    @AfterAll
    static void stop() {
        spark.close();
    }

    /** Index i's result: the model's nominal yield sum times i, computed where the task runs. */
    record YieldTimesIndex() implements RangeWork<double[], Double> {
        @Override
        public double[] worker(CompiledModel m) {
            return m.nominalYield();
        }

        @Override
        public Double run(double[] yields, CompiledModel m, int index) {
            double s = 0;
            for (double y : yields) s += y;
            return s * index;
        }
    }

    @Test
    void rangesComeBackInIndexOrderWithTheBroadcastModel() {
        int n = 101;   // not a multiple of the task count: uneven ranges
        List<Double> spark = SparkRunnerTest.spark.run(model, new YieldTimesIndex(), n, null);
        List<Double> threads = WorkRunner.threads(2).run(model, new YieldTimesIndex(), n, null);
        assertEquals(n, spark.size());
        assertEquals(threads, spark);
        double total = 0;
        for (double y : model.nominalYield()) total += y;
        assertEquals(100 * total, spark.get(100), 0);   // exact: the same sum in the same order
    }

    @Test
    void progressReachesTheTotalInTaskSteps() {
        List<Integer> seen = new ArrayList<>();
        spark.run(model, new YieldTimesIndex(), 64, done -> {
            synchronized (seen) {
                seen.add(done);
            }
        });
        assertEquals(64, seen.get(seen.size() - 1));
        for (int k = 1; k < seen.size(); k++) assertEquals(true, seen.get(k) >= seen.get(k - 1));
    }

    @Test
    void theModelSurvivesItsBytes() {
        CompiledModel back = ModelBytes.read(ModelBytes.of(model));
        assertArrayEquals(model.nominalYield(), back.nominalYield());
        assertArrayEquals(model.parameterNames(), back.parameterNames());
        assertEquals(model.labels(), back.labels());
    }

    @Test
    void localMastersGetRetries() {
        assertEquals("local[2,4]", SparkRunner.withRetries("local[2]"));
        assertEquals("local[*,4]", SparkRunner.withRetries("local[*]"));
        assertEquals("local[2,3]", SparkRunner.withRetries("local[2,3]"));
        assertEquals("spark://h:7077", SparkRunner.withRetries("spark://h:7077"));
    }
}
