package org.loopstand.plant.live;

import java.util.ArrayList;
import java.util.List;

import java.util.concurrent.CopyOnWriteArrayList;
import java.util.function.Consumer;

import org.loopstand.plant.check.TruthAce;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.FaultTarget;
import org.loopstand.protocol.site.AceConvention;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.HeldStartClock;
import org.loopstand.plant.runtime.PlantAgent;
import org.loopstand.plant.runtime.PlantCounters;
import org.loopstand.plant.runtime.StepLateness;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.time.Clock;

/**
 * Runs on the plant thread after every loop cycle and, once per {@code periodMs} of wall time, reads
 * the physics, the unit interfaces and the faults into a {@link LiveSnapshot} for the {@link LiveFeed}.
 * A sample costs a few hundred reads and one short lock; between samples a call is one clock read.
 */
public final class LiveSampler implements Consumer<PlantAgent> {
    private final LiveFeed feed;
    private final LiveBusTap bus;
    private final PlantCounters counters;
    private final StepLateness lateness;
    private final Clock wall;
    private final Clock scenario;
    private final long periodNanos;
    private final List<String> checks = new CopyOnWriteArrayList<>();
    private long nextNanos;
    private boolean finishedSampled;
    private long seq;

    /**
     * @param wall       paces the samples (wall time)
     * @param scenario   the plant's injected clock (ages of the controller's status)
     * @param periodMs   wall ms between samples, 50 – 10,000
     * @param checkNames the scenario's checks, shown as pending until decided
     */
    public LiveSampler(LiveFeed feed, LiveBusTap bus, PlantCounters counters, StepLateness lateness, Clock wall,
                       Clock scenario, long periodMs, List<String> checkNames) {
        if (periodMs < 50 || periodMs > 10_000) {
            throw new IllegalArgumentException("periodMs must be in [50, 10000], got " + periodMs);
        }
        this.feed = feed;
        this.bus = bus;
        this.counters = counters;
        this.lateness = lateness;
        this.wall = wall;
        this.scenario = scenario;
        this.periodNanos = periodMs * 1_000_000L;
        checkNames.forEach(n -> checks.add(n + ": pending"));
        this.nextNanos = wall.monotonicNanos();
    }

    @Override
    public void accept(PlantAgent agent) {
        long now = wall.monotonicNanos();
        boolean justFinished = agent.finished() && !finishedSampled;
        if (now < nextNanos && !justFinished) {
            return;
        }
        finishedSampled = agent.finished(); // the run's end is sampled at once, not up to a period later
        nextNanos = now + periodNanos;
        feed.offer(sample(agent));
    }

    /**
     * Plant thread, as the checks are decided at the end: replaces the pending list by the decided
     * lines and pushes the last snapshot again with them.
     */
    public void checkDecided(String line) {
        if (checks.stream().anyMatch(c -> c.endsWith(": pending"))) {
            checks.clear();
        }
        checks.add(line.replaceFirst("^plant: check ", ""));
        LiveSnapshot last = feed.latest();
        if (last != null) {
            feed.offer(new LiveSnapshot(++seq, last.timeS(), last.rate(), "finished", last.areas(), last.ties(), last.units(),
                    last.controller(), List.of(), List.copyOf(checks), last.lateness()));
        }
    }

    LiveSnapshot sample(PlantAgent agent) {
        GridSimulator sim = agent.grid();
        Grid g = sim.grid();
        ControllerStatus st = bus.status();
        List<LiveSnapshot.AreaView> areas = new ArrayList<>();
        for (int i = 0; i < g.areas().size(); i++) {
            Area a = g.areas().get(i);
            double scheduled = TruthAce.scheduledNetInterchangeMw(g, a.id());
            double ni = sim.netInterchangeMw(i);
            double df = sim.frequencyHz(i) - a.nominalFrequencyHz();
            double ace = a.aceConvention() == AceConvention.EUROPEAN ? (ni - scheduled) + a.kMwPerHz() * df
                    : (ni - scheduled) - 10 * a.biasMwPer01Hz() * df;
            areas.add(new LiveSnapshot.AreaView(a.id(), sim.frequencyHz(i), bus.meteredFrequencyHz(a.id()), ace,
                    controllerAce(st, a.id()), ni, scheduled));
        }
        List<LiveSnapshot.TieView> ties = new ArrayList<>();
        for (int i = 0; i < g.ties().size(); i++) {
            TieLine t = g.ties().get(i);
            ties.add(new LiveSnapshot.TieView(t.id(), t.fromArea(), t.toArea(), sim.tieFlowMw(i)));
        }
        List<LiveSnapshot.UnitView> units = new ArrayList<>();
        for (UnitDutyCycle h : agent.parts().units()) {
            UnitPlantInterface u = h.unit();
            int i = g.unitIndex(u.unitId());
            long refused = u.refusalCounts().values().stream().mapToLong(Long::longValue).sum();
            units.add(new LiveSnapshot.UnitView(u.unitId(), g.units().get(i).area(), sim.outputMw(i), sim.loadReferenceMw(i),
                    u.targetMw(), u.settings().regulatingMinMw(), u.settings().regulatingMaxMw(), u.controlMode().wireName(),
                    sim.isOnline(i), counters.lastCommand(u.unitId()), u.acceptedCount(), refused));
        }
        LiveSnapshot.ControllerView controller = st == null ? null
                : LiveSnapshot.ControllerView.of(st, (scenario.epochMillis() - bus.statusAtMs()) / 1000.0);
        List<LiveSnapshot.FaultView> faults = new ArrayList<>();
        FaultEngine engine = agent.faultEngineOnLoop();
        if (engine != null) {
            for (FaultEngine.FaultState fs : engine.states()) {
                if (fs.started() && !fs.ended()) {
                    FaultSpec f = fs.spec();
                    faults.add(new LiveSnapshot.FaultView(f.id(), f.type().name(),
                            f.targets().stream().map(FaultTarget::id).toList(), fs.source(), engine.activeForS(f)));
                }
            }
        }
        String state = agent.finished() ? "finished"
                : scenario instanceof HeldStartClock h && !h.released() ? "waiting" : "running";
        var hist = lateness.histogramUs();
        return new LiveSnapshot(++seq, sim.timeS(), agent.parts().rate(), state, areas, ties, units, controller, faults,
                List.copyOf(checks), new LiveSnapshot.LatenessView(hist.getValueAtPercentile(99), hist.getMaxValue(),
                hist.getTotalCount()));
    }

    private static double controllerAce(ControllerStatus st, String area) {
        if (st == null) {
            return Double.NaN;
        }
        for (AreaAce a : st.areas()) {
            if (a.area().equals(area)) {
                return a.aceMw();
            }
        }
        return Double.NaN;
    }

}
