package org.loopstand.app.rehearsal;

import java.util.concurrent.locks.LockSupport;
import java.util.function.BooleanSupplier;

import org.loopstand.protocol.time.SystemTime;

/** Waits up to a wall time while a condition holds, checking every 100 ms (process supervision only). */
final class WallWait {
    private WallWait() {
    }

    static void millis(long maxMs, BooleanSupplier whileTrue) {
        long end = SystemTime.wallMonotonicNanos() + maxMs * 1_000_000L;
        while (whileTrue.getAsBoolean() && SystemTime.wallMonotonicNanos() < end) {
            LockSupport.parkNanos(100_000_000L);
        }
    }
}
