package org.loopstand.bench.run;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.lang.management.MemoryUsage;
import java.util.ArrayList;
import java.util.List;
import java.util.OptionalLong;
import org.loopstand.protocol.time.Clock;

/**
 * Heap and CPU samples: heap used after the last GC (sum over heap pools of their collection usage,
 * no forced GC, so the run's timing is not disturbed), heap used now, this JVM's CPU and, when the
 * harness started it, the broker process's CPU (from /proc).
 */
final class ResourceSampler {
    record Sample(double tS, long heapAfterGcBytes, long heapUsedBytes, double jvmCpuPct, double brokerCpuPct) {
    }

    private final Clock clock;
    private final OptionalLong brokerPid;
    private final com.sun.management.OperatingSystemMXBean os =
            (com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
    private final List<Sample> samples = new ArrayList<>();
    private final long startNanos;
    private long lastNanos;
    private long lastJvmCpuNanos;
    private long lastBrokerTicks;

    ResourceSampler(Clock clock, OptionalLong brokerPid) {
        this.clock = clock;
        this.brokerPid = brokerPid;
        this.startNanos = clock.monotonicNanos();
        this.lastNanos = startNanos;
        this.lastJvmCpuNanos = os.getProcessCpuTime();
        this.lastBrokerTicks = brokerTicks();
    }

    /** Starts the CPU averages afresh (after the warm-up). */
    void reset() {
        lastNanos = clock.monotonicNanos();
        lastJvmCpuNanos = os.getProcessCpuTime();
        lastBrokerTicks = brokerTicks();
        samples.clear();
    }

    Sample sample() {
        long now = clock.monotonicNanos();
        long cpu = os.getProcessCpuTime();
        long ticks = brokerTicks();
        double wall = Math.max(1, now - lastNanos);
        double jvmPct = 100.0 * (cpu - lastJvmCpuNanos) / wall;
        double brokerPct = ticks < 0 ? Double.NaN : 100.0 * (ticks - lastBrokerTicks) * (1e9 / ProcStat.CLOCK_TICKS_PER_S) / wall;
        lastNanos = now;
        lastJvmCpuNanos = cpu;
        lastBrokerTicks = ticks;
        long afterGc = 0;
        long used = 0;
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            if (p.getType() != MemoryType.HEAP) {
                continue;
            }
            MemoryUsage cu = p.getCollectionUsage();
            afterGc += cu == null ? 0 : cu.getUsed();
            used += p.getUsage().getUsed();
        }
        Sample s = new Sample((now - startNanos) / 1e9, afterGc, used, jvmPct, brokerPct);
        samples.add(s);
        return s;
    }

    List<Sample> samples() {
        return List.copyOf(samples);
    }

    private long brokerTicks() {
        return brokerPid.isEmpty() ? -1 : ProcStat.cpuTicks(brokerPid.getAsLong());
    }
}
