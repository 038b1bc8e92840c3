package org.loopstand.protocol.time;

/**
 * The only class in the project that reads the operating system's clocks. Everything else gets time
 * through a {@link Clock}.
 */
public final class SystemTime {
    private SystemTime() {
    }

    /** @return wall time, epoch milliseconds. */
    public static long wallEpochMillis() {
        return System.currentTimeMillis();
    }

    /** @return the JVM's monotonic nanosecond counter. */
    public static long wallMonotonicNanos() {
        return System.nanoTime();
    }
}
