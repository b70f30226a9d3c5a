package plumb.validation.bench;

import org.openjdk.jmh.infra.BenchmarkParams;
import org.openjdk.jmh.infra.IterationParams;
import org.openjdk.jmh.profile.InternalProfiler;
import org.openjdk.jmh.results.AggregationPolicy;
import org.openjdk.jmh.results.IterationResult;
import org.openjdk.jmh.results.Result;
import org.openjdk.jmh.results.ScalarResult;

import java.lang.management.ManagementFactory;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * The process CPU time per operation of each JMH iteration, as the secondary score
 * {@value #LABEL} in the benchmark's time unit: {@code -prof plumb.validation.bench.CpuTimeProfiler}.
 * On a machine that other work keeps busy the wall time per operation mostly measures the load,
 * while the CPU time the benchmark's own process spent stays near its work (all its threads:
 * workers, the JIT compilers and the garbage collector included).
 */
public final class CpuTimeProfiler implements InternalProfiler {

    /** Name of the secondary score in JMH's output and JSON. */
    public static final String LABEL = "·cpu";

    private final com.sun.management.OperatingSystemMXBean os =
            (com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
    private long start;

    @Override
    public String getDescription() {
        return "process CPU time per operation";
    }

    @Override
    public void beforeIteration(BenchmarkParams benchmarkParams, IterationParams iterationParams) {
        start = os.getProcessCpuTime();
    }

    @Override
    public List<? extends Result<?>> afterIteration(BenchmarkParams benchmarkParams, IterationParams iterationParams,
                                                    IterationResult result) {
        long cpu = os.getProcessCpuTime() - start;
        long ops = result.getMetadata().getMeasuredOps();
        if (cpu < 0 || ops <= 0) return List.of();
        TimeUnit unit = benchmarkParams.getTimeUnit();
        double perOp = (double) cpu / ops / TimeUnit.NANOSECONDS.convert(1, unit);
        return List.of(new ScalarResult(LABEL, perOp, symbol(unit) + "/op", AggregationPolicy.AVG));
    }

    /** JMH's own unit names: "ns", "us", "ms", "s". */
    static String symbol(TimeUnit unit) {
        return switch (unit) {
            case NANOSECONDS -> "ns";
            case MICROSECONDS -> "us";
            case MILLISECONDS -> "ms";
            case SECONDS -> "s";
            case MINUTES -> "min";
            case HOURS -> "hr";
            case DAYS -> "day";
        };
    }
}
