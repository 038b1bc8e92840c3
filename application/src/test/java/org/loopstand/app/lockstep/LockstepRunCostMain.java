package org.loopstand.app.lockstep;

import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.Arrays;

/**
 * CPU time and allocation of closed-loop lockstep runs, measured on the running thread alone (JIT and
 * GC threads not counted), so that other load on a shared machine disturbs the figure less than a
 * process's user time. Not a unit test, no assertion on time; figures go to docs/performance.md.
 *
 * <p>Args: site scenario runs warmUpRuns [firstSeed]. Runs {@code runs} times the scenario with seeds
 * firstSeed, firstSeed + 1, … ({@link LockstepRehearsal#checksOnly()}, what a campaign worker runs)
 * and prints each run's thread CPU and allocated bytes, then the median and mean of the runs after
 * the warm-up ones.
 */
public final class LockstepRunCostMain {
    private LockstepRunCostMain() {
    }

    public static void main(String[] args) throws Exception {
        Path site = Path.of(args[0]);
        Path scenario = Path.of(args[1]);
        int runs = Integer.parseInt(args[2]);
        int warmUpRuns = Integer.parseInt(args[3]);
        long firstSeed = args.length > 4 ? Long.parseLong(args[4]) : 1;
        com.sun.management.ThreadMXBean threads = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
        long thread = Thread.currentThread().getId();
        double[] cpuMs = new double[runs - warmUpRuns];
        double[] allocatedMb = new double[runs - warmUpRuns];
        for (int i = 0; i < runs; i++) {
            long cpuBeforeNs = threads.getThreadCpuTime(thread);
            long allocatedBefore = threads.getThreadAllocatedBytes(thread);
            int passed = (int) new LockstepRehearsal(site, scenario, firstSeed + i).checksOnly().stream()
                    .filter(o -> o.passed()).count();
            double runCpuMs = (threads.getThreadCpuTime(thread) - cpuBeforeNs) / 1e6;
            double runMb = (threads.getThreadAllocatedBytes(thread) - allocatedBefore) / 1e6;
            System.out.printf("run %d seed %d: %.0f ms CPU, %.1f MB allocated, %d checks passed%s%n", i + 1, firstSeed + i,
                    runCpuMs, runMb, passed, i < warmUpRuns ? " (warm-up)" : "");
            if (i >= warmUpRuns) {
                cpuMs[i - warmUpRuns] = runCpuMs;
                allocatedMb[i - warmUpRuns] = runMb;
            }
        }
        System.out.printf("after %d warm-up runs, %d runs: CPU median %.0f ms, mean %.0f ms; allocated median %.1f MB,"
                + " mean %.1f MB%n", warmUpRuns, cpuMs.length, median(cpuMs), mean(cpuMs), median(allocatedMb),
                mean(allocatedMb));
    }

    private static double median(double[] values) {
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        int n = sorted.length;
        return n % 2 == 1 ? sorted[n / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
    }

    private static double mean(double[] values) {
        return Arrays.stream(values).average().orElse(Double.NaN);
    }
}
