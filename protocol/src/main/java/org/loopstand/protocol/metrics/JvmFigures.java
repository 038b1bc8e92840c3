package org.loopstand.protocol.metrics;

import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryUsage;

/** The JVM's own figures (memory, threads, garbage collection, uptime, CPU) for a metrics page. */
public final class JvmFigures {
    private JvmFigures() {
    }

    /** Appends the JVM families to {@code page}. */
    public static void writeTo(PrometheusText page) {
        var memory = ManagementFactory.getMemoryMXBean();
        MemoryUsage heap = memory.getHeapMemoryUsage();
        MemoryUsage nonHeap = memory.getNonHeapMemoryUsage();
        page.gauge("jvm_memory_used_bytes", "memory in use, bytes")
                .sample(heap.getUsed(), "area", "heap").sample(nonHeap.getUsed(), "area", "nonheap");
        page.gauge("jvm_memory_max_bytes", "most memory the JVM may use, bytes (-1 = no limit)")
                .sample(heap.getMax(), "area", "heap").sample(nonHeap.getMax(), "area", "nonheap");
        page.gauge("jvm_threads_live", "live threads").sample(ManagementFactory.getThreadMXBean().getThreadCount());
        page.counter("jvm_gc_collections_total", "garbage collections per collector");
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            page.sample(Math.max(0, gc.getCollectionCount()), "gc", gc.getName());
        }
        page.counter("jvm_gc_collection_seconds_total", "time spent in garbage collection per collector, s");
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            page.sample(Math.max(0, gc.getCollectionTime()) / 1000.0, "gc", gc.getName());
        }
        page.gauge("process_uptime_seconds", "time since the JVM started, s")
                .sample(ManagementFactory.getRuntimeMXBean().getUptime() / 1000.0);
        if (ManagementFactory.getOperatingSystemMXBean() instanceof com.sun.management.OperatingSystemMXBean os) {
            page.counter("process_cpu_seconds_total", "CPU time used by the process, s").sample(os.getProcessCpuTime() / 1e9);
        }
    }
}
