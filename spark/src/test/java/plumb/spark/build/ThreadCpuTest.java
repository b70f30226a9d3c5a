package plumb.spark.build;

import org.junit.jupiter.api.Test;

import java.lang.management.ManagementFactory;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** build-speed's split of CPU by thread kind: the names it sorts, and the time it counts. */
class ThreadCpuTest {

    @Test
    void threadNamesGoToTheirKind() {
        assertEquals("tasks", BuildSpeed.ThreadCpu.kind("Executor task launch worker for task 0.0 in stage 3.0 (TID 7)"));
        assertEquals("driver", BuildSpeed.ThreadCpu.kind("main"));
        assertEquals("JIT", BuildSpeed.ThreadCpu.kind("C2 CompilerThre"));
        assertEquals("GC", BuildSpeed.ThreadCpu.kind("GC Thread#1"));
        assertEquals("other", BuildSpeed.ThreadCpu.kind("dag-scheduler-e"));
    }

    @Test
    void aBusyThreadsCpuIsCounted() {
        Map<String, Double> before = BuildSpeed.ThreadCpu.byGroup();
        if (before.isEmpty()) return;   // not Linux: the command prints no split
        var bean = ManagementFactory.getThreadMXBean();
        long c0 = bean.getCurrentThreadCpuTime();
        double x = 0;
        while (bean.getCurrentThreadCpuTime() - c0 < 300_000_000L) {
            for (int i = 1; i < 100_000; i++) x += Math.sqrt(i);
        }
        double own = (bean.getCurrentThreadCpuTime() - c0) * 1e-9;
        Map<String, Double> after = BuildSpeed.ThreadCpu.byGroup();
        double counted = 0;
        for (String k : after.keySet()) counted += after.get(k) - before.get(k);
        // this thread's 0.3 s at least (less one clock tick at each end), plus whatever else ran
        assertTrue(counted >= own - 0.03 && x > 0, counted + " s counted, " + own + " s of this thread");
    }
}
