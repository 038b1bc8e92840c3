package org.loopstand.plant.runtime;

import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.function.DoubleToLongFunction;

import org.loopstand.plant.engine.ScenarioEngine;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.time.Clock;

import com.fasterxml.jackson.databind.ObjectMapper;

/**
 * What the plant loop writes into its run journal: the physics truth every truth interval of
 * scenario time, step lateness, fired scenario events, process events queued from other threads,
 * and the closing summary. Inactive (every call a no-op) until {@link #attach}.
 */
final class PlantLoopJournal implements ScenarioEngine.EventListener {
    private static final ObjectMapper EVENT_MAPPER = new ObjectMapper();

    private final Clock clock;
    private final GridSimulator sim;
    private final List<UnitDutyCycle> units;
    private final DoubleToLongFunction epochMsAt;
    private final ConcurrentLinkedQueue<Map<String, Object>> pendingEvents = new ConcurrentLinkedQueue<>();
    private volatile PlantRunJournal journal;
    private double truthIntervalS = 1.0;
    private double nextTruthS;

    /** @param epochMsAt scenario epoch ms of a simulated time in s */
    PlantLoopJournal(Clock clock, GridSimulator sim, List<UnitDutyCycle> units, DoubleToLongFunction epochMsAt) {
        this.clock = clock;
        this.sim = sim;
        this.units = units;
        this.epochMsAt = epochMsAt;
    }

    /** Before the loop starts: journals into {@code j}, truth every {@code truthIntervalS} s of scenario time (&gt; 0). */
    void attach(PlantRunJournal j, double truthIntervalS) {
        if (!(truthIntervalS > 0)) {
            throw new IllegalArgumentException("truthIntervalS must be positive, got " + truthIntervalS);
        }
        this.truthIntervalS = truthIntervalS;
        this.nextTruthS = sim.timeS();
        this.journal = j;
    }

    /** @return the journal, or null when the run keeps none */
    PlantRunJournal journal() {
        return journal;
    }

    /** Any thread: queues a process event ({@code fields} holds {@code event}). */
    void note(Map<String, Object> fields) {
        pendingEvents.add(fields);
    }

    /** Loop thread, after each physics step: its lateness and the truth when due. */
    void stepped(long latenessNanos) {
        PlantRunJournal j = journal;
        if (j == null) {
            return;
        }
        j.record(PlantRunJournal.STEP_LATENESS_US, Math.max(0, latenessNanos) / 1_000);
        double t = sim.timeS();
        if (t + sim.stepS() * 1e-6 < nextTruthS) {
            return;
        }
        nextTruthS += truthIntervalS * (Math.floor((t - nextTruthS) / truthIntervalS + 1e-9) + 1);
        Map<String, String> modes = new HashMap<>();
        for (UnitDutyCycle h : units) {
            modes.put(h.unit().unitId(), h.unit().controlMode().wireName());
        }
        j.truth(epochMsAt.applyAsLong(t), sim, modes);
    }

    @Override
    public void fired(double timeS, ScenarioEvent event) {
        PlantRunJournal j = journal;
        if (j != null) {
            j.event(epochMsAt.applyAsLong(timeS), eventFields(event));
        }
    }

    /** Loop thread: writes the queued process events and flushes when due. @return events written */
    int drainAndFlush() {
        PlantRunJournal j = journal;
        if (j == null) {
            return 0;
        }
        int n = drain(j);
        j.flushIfDue();
        return n;
    }

    /** Loop thread: flushes when due (nothing else happens once the scenario ended). */
    void flushIfDue() {
        PlantRunJournal j = journal;
        if (j != null) {
            j.flushIfDue();
        }
    }

    private int drain(PlantRunJournal j) {
        int n = 0;
        for (Map<String, Object> e; (e = pendingEvents.poll()) != null; n++) {
            j.event(clock.epochMillis(), e);
        }
        return n;
    }

    /** Closes the journal with the run's summary, if it is open. */
    void close(StepLateness lateness, long meterSent, long meterDropped, boolean completed) {
        PlantRunJournal j = journal;
        if (j == null || j.isClosed()) {
            return;
        }
        drain(j);
        var h = lateness.histogramUs();
        j.event(clock.epochMillis(), Map.of("event", "summary", "simulatedS", sim.timeS(),
                "steps", sim.stepCount(), "meterSent", meterSent, "meterDropped", meterDropped,
                "stepLatenessP99Us", h.getValueAtPercentile(99), "stepLatenessMaxUs", h.getMaxValue()));
        j.close(Math.max(clock.epochMillis(), epochMsAt.applyAsLong(sim.timeS())),
                completed ? EndReason.COMPLETED : EndReason.STOPPED);
    }

    /** {@code {"event": type, "atS": …, …the event's own fields}}; falls back to its text form. */
    static Map<String, Object> eventFields(ScenarioEvent e) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", e.type());
        f.put("atS", e.atS());
        try {
            Map<?, ?> own = EVENT_MAPPER.convertValue(e, Map.class);
            own.forEach((k, v) -> {
                String name = String.valueOf(k);
                if (!f.containsKey(name) && !"t".equals(name) && !"kind".equals(name)) {
                    f.put(name, v);
                }
            });
        } catch (IllegalArgumentException ex) {
            f.put("detail", e.toString());
        }
        return f;
    }
}
