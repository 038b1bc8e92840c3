package org.loopstand.bench.run;

import org.HdrHistogram.Recorder;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.config.SiteArea;
import org.loopstand.controller.cycle.CycleOutcome;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.time.Clock;

/**
 * Drives the real {@link ControllerAgent} and, after each cycle, records the age of every input the
 * cycle used (cycle time − source time, ms) and how long the cycle's work took.
 */
final class ProbedController implements Agent {
    private final ControllerAgent inner;
    private final Iterable<SiteArea> areas;
    private final Clock clock;
    final Recorder unitAgeMs = new Recorder(3);
    final Recorder meterAgeMs = new Recorder(3);
    final Recorder cycleWorkUs = new Recorder(3);
    private long cyclesSeen;
    /** The latest cycle's decision in one line (state, reasons, commands, notes), for the run log. */
    volatile String lastDecision = "no cycle yet";

    ProbedController(ControllerAgent inner, Iterable<SiteArea> areas, Clock clock) {
        this.inner = inner;
        this.areas = areas;
        this.clock = clock;
    }

    @Override
    public void onStart() {
        inner.onStart();
    }

    @Override
    public int doWork() {
        long t0 = clock.monotonicNanos();
        int w = inner.doWork();
        if (inner.cyclesRun() != cyclesSeen) {
            cycleWorkUs.recordValue((clock.monotonicNanos() - t0) / 1000);
            cyclesSeen = inner.cyclesRun();
            CycleOutcome o = inner.lastOutcome();
            long now = o.nowMs();
            lastDecision = "cycle " + o.cycleNumber() + " " + o.state() + " reasons " + head(o.reasons())
                    + " commands " + o.commands().size() + " notes " + head(o.notes());
            for (UnitState s : inner.intake().unitStates(now)) {
                unitAgeMs.recordValue(Math.max(0, now - s.telemetryTimeMs()));
            }
            for (SiteArea a : areas) {
                ValidatedValue v = inner.intake().frequencyInput(a.id()).evaluate(now);
                if (v.ageMs() >= 0 && v.ageMs() < Long.MAX_VALUE / 2) {
                    meterAgeMs.recordValue(v.ageMs());
                }
            }
        }
        return w;
    }

    private static String head(java.util.List<String> items) {
        return items.size() <= 6 ? items.toString() : items.subList(0, 6) + " … (" + items.size() + ")";
    }

    @Override
    public void onClose() {
        inner.onClose();
    }

    @Override
    public String roleName() {
        return inner.roleName();
    }
}
