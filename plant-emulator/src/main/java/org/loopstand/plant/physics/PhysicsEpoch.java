package org.loopstand.plant.physics;

/**
 * The scenario epoch ms of the simulator's state: the time stamp of every measurement taken from it
 * (meter readings, unit telemetry, field readings). A real-time plant whose physics lags its clock
 * holds an older state than the clock says; a reading of that state is as old as the state, so it
 * carries the state's time, and a controller judging the age of its data sees the lag.
 *
 * <p>Simulated time 0 is the epoch given to {@link #startAt} (the plant loop sets it when it starts
 * counting its steps, so that both count from the same instant). Reads the simulator's time, so use it
 * on the thread that owns the simulator.
 */
public final class PhysicsEpoch {
    private final GridSimulator sim;
    private long startEpochMs;

    public PhysicsEpoch(GridSimulator sim) {
        this.sim = sim;
    }

    /** Owner thread, before the first step: simulated time 0 is {@code startEpochMs} (scenario epoch ms). */
    public void startAt(long startEpochMs) {
        this.startEpochMs = startEpochMs;
    }

    /** @return scenario epoch ms of simulated time {@code timeS} (s, ≥ 0) */
    public long epochMsAt(double timeS) {
        return startEpochMs + Math.round(timeS * 1000);
    }

    /** @return scenario epoch ms of the state the simulator holds now */
    public long nowEpochMs() {
        return epochMsAt(sim.timeS());
    }
}
