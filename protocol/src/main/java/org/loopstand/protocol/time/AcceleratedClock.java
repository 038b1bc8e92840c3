package org.loopstand.protocol.time;

/**
 * Scenario time that runs {@code rate} times faster than wall time from a given start. Used for
 * accelerated rehearsals; the plant publishes the start and rate on the clock topic so a controller
 * can follow the same time base.
 */
public final class AcceleratedClock implements Clock {
    /** Highest rate accepted; beyond it real-time pacing on 2 cores is not meaningful. */
    public static final double MAX_RATE = 1000.0;

    private final Clock wall;
    private final double rate;
    private final long startScenarioEpochMillis;
    private final long wallStartNanos;

    /**
     * @param wall                     the underlying real-time clock
     * @param rate                     speed-up, 0 &lt; rate ≤ {@value #MAX_RATE} (1 = real time)
     * @param startScenarioEpochMillis scenario time at the moment of construction, epoch ms
     */
    public AcceleratedClock(Clock wall, double rate, long startScenarioEpochMillis) {
        if (!(rate > 0.0) || rate > MAX_RATE || Double.isNaN(rate)) {
            throw new IllegalArgumentException("rate must be in (0, " + MAX_RATE + "], got " + rate);
        }
        this.wall = wall;
        this.rate = rate;
        this.startScenarioEpochMillis = startScenarioEpochMillis;
        this.wallStartNanos = wall.monotonicNanos();
    }

    /** @return the speed-up factor (scenario seconds per wall second). */
    public double rate() {
        return rate;
    }

    /** @return scenario epoch ms at start. */
    public long startScenarioEpochMillis() {
        return startScenarioEpochMillis;
    }

    @Override
    public long epochMillis() {
        return startScenarioEpochMillis + (monotonicNanos() / 1_000_000L);
    }

    @Override
    public long monotonicNanos() {
        return (long) ((wall.monotonicNanos() - wallStartNanos) * rate);
    }

    /**
     * Wall nanoseconds to wait for {@code scenarioNanos} of scenario time to pass.
     *
     * @param scenarioNanos scenario duration, ns, ≥ 0
     * @return wall duration, ns
     */
    public long wallNanosFor(long scenarioNanos) {
        return (long) (scenarioNanos / rate);
    }

    @Override
    public String toString() {
        return "accelerated clock x" + rate;
    }
}
