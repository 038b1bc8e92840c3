package org.loopstand.plant.runtime;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.RunPhase;
import org.loopstand.protocol.message.RunState;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Tells every controller where the plant's run is, on the retained {@code …/run} topic: waiting
 * (connected, scenario time held), running, ended (the explicit end-of-run signal), and publishes
 * the site's schedules retained at start so a controller finds the scheduled interchange and
 * frequency without waiting for a scenario event. Any thread; each call publishes at once.
 */
public final class RunAnnouncer {
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final Clock clock;
    private final String runId;
    private final Long durationMs;
    private final double rate;
    private long seq;

    /**
     * @param clock      scenario clock (stamps sourceTime, as every other plant message)
     * @param runId      this run's id, new at every plant start (an id: letters, digits, _ and -, ≤ 64)
     * @param durationS  the scenario's length, s, or NaN without a scenario
     * @param rate       scenario seconds per wall second, (0, 1000]
     */
    public RunAnnouncer(MessageBus bus, TopicTree topics, MessageCodec codec, Clock clock, String runId, double durationS,
                        double rate) {
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.clock = clock;
        this.runId = runId;
        this.durationMs = Double.isNaN(durationS) ? null : Math.round(durationS * 1000);
        this.rate = rate;
        this.seq = clock.epochMillis();
    }

    /** @return a run id from the wall time of the start and the process id: new at every start */
    public static String newRunId(long wallEpochMs, long pid) {
        return "run-" + wallEpochMs + "-" + pid;
    }

    public String runId() {
        return runId;
    }

    /**
     * @param phase          where the run is
     * @param scenarioTimeMs time since scenario start, ms
     * @param endReason      {@code completed} or {@code stopped} with {@link RunPhase#ENDED}, else null
     */
    public synchronized void announce(RunPhase phase, long scenarioTimeMs, String endReason) {
        RunState s = new RunState(seq++, clock.epochMillis(), runId, phase, Math.max(0, scenarioTimeMs), durationMs, rate,
                endReason);
        bus.publish(new OutboundMessage(topics.run(), codec.encode(s), Qos.AT_LEAST_ONCE, true, 0));
    }

    /** Publishes every area's schedule from the site (ties' scheduled flows, nominal frequency), retained. */
    public static void publishSiteSchedules(Grid grid, org.loopstand.plant.scenario.PlantControls plant) {
        for (Area a : grid.areas()) {
            plant.publishSchedule(a.id(), grid.scheduledNetInterchangeMw(a.id()), a.nominalFrequencyHz());
        }
    }
}
