package org.loopstand.bench.run;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** A process's CPU time and resident memory from Linux's /proc, for processes the bench started. */
final class ProcStat {
    /** USER_HZ on Linux: the unit of utime and stime in /proc/PID/stat. */
    static final long CLOCK_TICKS_PER_S = 100;

    private ProcStat() {
    }

    /** @return user + system CPU time of the process, clock ticks ({@link #CLOCK_TICKS_PER_S}), or −1 when unreadable */
    static long cpuTicks(long pid) {
        try {
            String stat = Files.readString(Path.of("/proc/" + pid + "/stat"));
            String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
            return Long.parseLong(f[11]) + Long.parseLong(f[12]); // utime + stime (fields 14, 15)
        } catch (IOException | RuntimeException e) {
            return -1;
        }
    }

    /** @return the process's resident set size (VmRSS), bytes, or −1 when unreadable */
    static long residentBytes(long pid) {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/" + pid + "/status"))) {
                if (line.startsWith("VmRSS:")) {
                    return Long.parseLong(line.replaceAll("[^0-9]", "")) * 1024;
                }
            }
        } catch (IOException | RuntimeException e) {
            return -1;
        }
        return -1;
    }

    /** @return the 1-minute load average, or NaN when unreadable */
    static double loadAverage1Min() {
        try {
            return Double.parseDouble(Files.readString(Path.of("/proc/loadavg")).split(" ")[0]);
        } catch (IOException | RuntimeException e) {
            return Double.NaN;
        }
    }
}
