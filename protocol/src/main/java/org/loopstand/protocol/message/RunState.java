package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * The plant's run as a whole, retained on {@code …/run}: a controller learns from it that a run is
 * waiting, running or over (the explicit end-of-run signal), which run it belongs to (a new
 * {@code runId} means the plant restarted: sequence numbers and clocks start afresh), and how long
 * the scenario lasts.
 *
 * @param seq            per-publisher sequence number, ≥ 0
 * @param sourceTime     epoch ms at the source (scenario time when the rate is not 1), &gt; 0
 * @param runId          this plant run's id, new at every plant start
 * @param phase          waiting, running or ended
 * @param scenarioTimeMs time since scenario start, ms, ≥ 0
 * @param durationMs     the scenario's length, ms, ≥ 0; absent when the plant runs without a scenario
 * @param rate           scenario seconds per wall second, in (0, 1000]
 * @param endReason      with phase ended: {@code completed} (the scenario ran to its end) or
 *                       {@code stopped}; absent otherwise
 */
public record RunState(long seq, long sourceTime, String runId, RunPhase phase, long scenarioTimeMs,
        @OptionalField Long durationMs, double rate, @OptionalField String endReason) {
    public RunState {
        Objects.requireNonNull(runId, "runId");
        Objects.requireNonNull(phase, "phase");
    }
}
