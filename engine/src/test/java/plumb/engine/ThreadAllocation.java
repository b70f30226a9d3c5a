package plumb.engine;

import java.lang.management.ManagementFactory;

/** Bytes the current thread allocates while running a piece of work (the JVM's per-thread counter). */
public final class ThreadAllocation {

    private ThreadAllocation() {
    }

    public static long bytesAllocatedBy(Runnable work) {
        com.sun.management.ThreadMXBean bean = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long id = Thread.currentThread().getId();
        long before = bean.getThreadAllocatedBytes(id);
        work.run();
        return bean.getThreadAllocatedBytes(id) - before;
    }
}
