package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import org.loopstand.protocol.time.Clock;

/**
 * Which faults are active now. Scenario faults are scheduled up front; live faults start and stop by
 * order. {@link #update()} (called from the owning agent's duty cycle) fires the transitions: it tells
 * the {@link FaultObserver}, acts on registered {@link LinkFaultControl}s and makes the faults visible
 * to the publication stage, the command stage and the plant flags. Single-threaded: one agent owns it.
 */
public final class FaultEngine {
    /** Source names journaled with each transition. */
    public static final String SOURCE_SCENARIO = "scenario";
    public static final String SOURCE_ORDER = "order";

    private final Clock clock;
    private final long runStartEpochMs;
    private final FaultObserver observer;
    private final Map<String, Window> windows = new LinkedHashMap<>();
    private final Map<String, LinkFaultControl> links = new LinkedHashMap<>();
    /** the registered links, each once, in registration order (polled every update without allocating) */
    private final List<LinkFaultControl> distinctLinks = new ArrayList<>();
    /** changes whenever the active faults change: lets flag views cache what they read */
    private long generation;
    private final List<FaultSpec> active = new ArrayList<>();
    private final java.util.Set<String> tripOrdered = new java.util.HashSet<>();
    private HostLinks hostLinks = HostLinks.NONE;

    /**
     * @param clock           the run's scenario clock
     * @param runStartEpochMs scenario time of t = 0 s, epoch ms (fault windows are relative to it)
     * @param observer        journal and run record
     */
    public FaultEngine(Clock clock, long runStartEpochMs, FaultObserver observer) {
        this.clock = clock;
        this.runStartEpochMs = runStartEpochMs;
        this.observer = observer;
    }

    /** Lets connection faults on {@code connectionId} act on a real connection. */
    public void registerLink(String connectionId, LinkFaultControl control) {
        links.put(connectionId, control);
        if (!distinctLinks.contains(control)) {
            distinctLinks.add(control);
        }
    }

    /** Lets network faults act on the links between the run's hosts. */
    public void useHostLinks(HostLinks links) {
        this.hostLinks = links;
    }

    /** @return scenario seconds since the run start */
    public double nowS() {
        return (clock.epochMillis() - runStartEpochMs) / 1000.0;
    }

    public long nowMs() {
        return clock.epochMillis();
    }

    /**
     * Schedules a scenario fault.
     *
     * @return why it was refused (id taken, contradicts another fault), if it was
     */
    public Optional<String> schedule(FaultSpec spec) {
        return add(spec, SOURCE_SCENARIO);
    }

    /**
     * Starts a live fault now: its window is moved to [now, now + its length).
     *
     * @return why it was refused, if it was (also told to the observer)
     */
    public Optional<String> startNow(FaultSpec spec) {
        double now = nowS();
        double length = spec.endS() - spec.startS();
        FaultSpec moved = new FaultSpec(spec.id(), spec.type(), spec.targets(), spec.parameters(), now, now + length);
        Optional<String> refused = add(moved, SOURCE_ORDER);
        refused.ifPresent(r -> observer.faultRefused(nowMs(), spec.id(), r));
        if (refused.isEmpty()) {
            update();
        }
        return refused;
    }

    /** Ends a fault now (live or scheduled). @return why not, if the id is unknown or already ended */
    public Optional<String> stop(String faultId, String reason) {
        Window w = windows.get(faultId);
        if (w == null || w.ended) {
            String why = w == null ? "no fault '" + faultId + "' (known: " + windows.keySet() + ")"
                    : "fault '" + faultId + "' has ended already";
            observer.faultRefused(nowMs(), faultId, why);
            return Optional.of(why);
        }
        if (!w.started) {
            w.ended = true;
            observer.faultStopped(nowMs(), w.spec, w.source, reason + " (before it started)");
            return Optional.empty();
        }
        end(w, reason);
        return Optional.empty();
    }

    private Optional<String> add(FaultSpec spec, String source) {
        if (windows.containsKey(spec.id())) {
            return Optional.of("fault id '" + spec.id() + "' is in use already");
        }
        for (Window w : windows.values()) {
            if (!w.ended && w.spec.contradicts(spec)) {
                return Optional.of("contradicts fault '" + w.spec.id() + "' (" + w.spec.type().name()
                        + ") on the same target at overlapping times");
            }
        }
        windows.put(spec.id(), new Window(spec, source));
        return Optional.empty();
    }

    /** Fires every start and end that is due now. @return how many transitions fired */
    public int update() {
        double now = nowS();
        int fired = 0;
        for (Window w : windows.values()) {
            if (!w.started && !w.ended && w.spec.startS() <= now + 1e-9) {
                begin(w);
                fired++;
            }
            if (w.started && !w.ended && w.spec.endS() <= now + 1e-9) {
                end(w, "window ended");
                fired++;
            }
        }
        for (int i = 0; i < distinctLinks.size(); i++) {
            fired += distinctLinks.get(i).poll();
        }
        return fired;
    }

    private void begin(Window w) {
        w.started = true;
        w.startedAtMs = nowMs();
        active.add(w.spec);
        generation++;
        observer.faultStarted(w.startedAtMs, w.spec, w.source);
        if (w.spec.behaviour() instanceof PlantFault pf && pf.tripsUnit()) {
            w.spec.targets().forEach(t -> tripOrdered.add(t.id()));
        }
        if (w.spec.behaviour() instanceof NetworkFault nf) {
            changeHostLink(w.spec, nf, true);
        }
        if (w.spec.behaviour() instanceof LinkFault lf) {
            for (FaultTarget t : w.spec.targets()) {
                LinkFaultControl link = links.get(t.id());
                if (link == null) {
                    continue; // study mode: the publication stage emulates the outage for its own connection
                }
                lf.cut(link);
                double refuse = lf.refuseReconnectS();
                link.refuseReconnectForS(Double.isNaN(refuse) ? w.spec.endS() - w.spec.startS() : refuse);
            }
        }
    }

    private void end(Window w, String reason) {
        w.ended = true;
        active.remove(w.spec);
        generation++;
        observer.faultStopped(nowMs(), w.spec, w.source, reason);
        if (w.spec.behaviour() instanceof NetworkFault nf) {
            changeHostLink(w.spec, nf, false);
        }
        if (w.spec.behaviour() instanceof LinkFault lf && Double.isNaN(lf.refuseReconnectS())) {
            for (FaultTarget t : w.spec.targets()) {
                LinkFaultControl link = links.get(t.id());
                if (link != null) {
                    link.refuseReconnectForS(0);
                }
            }
        }
    }

    /**
     * Applies ({@code start}) or lifts a network fault through the host links and tells the observer
     * what was done or why it could not be: a network fault never passes silently.
     */
    private void changeHostLink(FaultSpec spec, NetworkFault fault, boolean start) {
        String a = spec.targets().get(0).id();
        String b = spec.targets().get(1).id();
        try {
            List<String> changed = start ? hostLinks.apply(fault, a, b) : hostLinks.lift(fault, a, b);
            observer.networkFault(nowMs(), spec, start ? fault.action() : fault.action() + "Lifted", changed, "");
        } catch (HostLinks.HostLinkException e) {
            observer.networkFault(nowMs(), spec, start ? "notApplied" : "notLifted", List.of(), e.getMessage());
        }
    }

    /** @return active faults, in start order */
    public List<FaultSpec> active() {
        return List.copyOf(active);
    }

    /** @return active faults of one category on one target */
    public List<FaultSpec> active(FaultCategory category, TargetKind kind, String targetId) {
        List<FaultSpec> out = new ArrayList<>();
        for (FaultSpec f : active) {
            if (f.type().category() == category && f.targets(kind, targetId)) {
                out.add(f);
            }
        }
        return out;
    }

    /** @return active faults of any category on one target */
    public List<FaultSpec> active(TargetKind kind, String targetId) {
        List<FaultSpec> out = new ArrayList<>();
        for (FaultSpec f : active) {
            if (f.targets(kind, targetId)) {
                out.add(f);
            }
        }
        return out;
    }

    /** @return whether a connection fault is holding {@code connectionId} down now */
    public boolean connectionDown(String connectionId) {
        return !active(FaultCategory.CONNECTION, TargetKind.CONNECTION, connectionId).isEmpty();
    }

    /** @return seconds since the fault became active (0 if not active) */
    public double activeForS(FaultSpec spec) {
        Window w = windows.get(spec.id());
        return w == null || !w.started ? 0 : (nowMs() - w.startedAtMs) / 1000.0;
    }

    /** @return every fault known, with its state, for {@code fault list} and reports */
    public List<FaultState> states() {
        List<FaultState> out = new ArrayList<>();
        windows.values().forEach(w -> out.add(new FaultState(w.spec, w.source, w.started, w.ended)));
        return out;
    }

    /** @return a number that changes whenever a fault starts or ends (for views that cache what they read) */
    public long generation() {
        return generation;
    }

    /** @return whether a plant trip was ordered for the unit at any time in the run (a trip is not undone) */
    public boolean tripOrdered(String unit) {
        return tripOrdered.contains(unit);
    }

    /** @return live plant fault flags of one unit */
    public PlantFaultFlags plantFlags(String unit) {
        return new PlantFlagsView(this, unit);
    }

    /** A fault and where it stands. */
    public record FaultState(FaultSpec spec, String source, boolean started, boolean ended) {
    }

    private static final class Window {
        final FaultSpec spec;
        final String source;
        boolean started;
        boolean ended;
        long startedAtMs;

        Window(FaultSpec spec, String source) {
            this.spec = spec;
            this.source = source;
        }
    }
}
