package org.loopstand.plant.check;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.FaultTarget;
import org.loopstand.plant.fault.Publication;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

/**
 * What a run leaves for the checks, all from the plant side: physics truth sampled over time, fault
 * windows, what was published, every command received and what was done with it, and (for the
 * controller-side checks only) the controller status as published. Filled while the run goes (it
 * listens to the fault stage as a {@link FaultObserver}) or from a journal. Times are scenario s
 * since the run start. Single-threaded.
 */
public final class RunRecord implements FaultObserver, org.loopstand.plant.fault.CommandOutcomeListener {
    /** A sampled series. */
    public static final class Series {
        final List<Double> timesS = new ArrayList<>();
        final List<Double> values = new ArrayList<>();

        public void add(double tS, double v) {
            timesS.add(tS);
            values.add(v);
        }

        public int size() {
            return timesS.size();
        }

        public double timeS(int i) {
            return timesS.get(i);
        }

        public double value(int i) {
            return values.get(i);
        }
    }

    /** A fault's window as it happened (endS = +∞ while still active at the end). */
    public record FaultWindow(String id, String type, String category, List<String> targets, double startS, double endS) {
    }

    /**
     * One command that reached the plant side.
     *
     * @param receivedS when it arrived at the plant, s
     * @param command   the command
     * @param fate      what the command stage did (passed, dropped, delayed, duplicated) or "handled"
     * @param outcome   the unit's ack outcome; null when it never reached the unit
     * @param reason    refusal reason; null when accepted or not answered
     * @param acted     whether the unit moved its load reference for it
     */
    public record CommandRecord(double receivedS, UnitCommand command, String fate, AckOutcome outcome, RefusalReason reason,
                                boolean acted) {
    }

    /** A controller status as received on the bus. */
    public record StatusRecord(double receivedS, ControllerStatus status) {
    }

    /** A schedule that came into force (scheduleChange event), s. */
    public record ScheduleRecord(double atS, String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
    }

    /** A scenario event as it fired. */
    public record EventRecord(double atS, String type, String description) {
    }

    private final long runStartEpochMs;
    private final Map<String, Series> series = new LinkedHashMap<>();
    private final Map<String, FaultWindow> faults = new LinkedHashMap<>();
    private final List<CommandRecord> commands = new ArrayList<>();
    private final List<StatusRecord> statuses = new ArrayList<>();
    private final List<EventRecord> events = new ArrayList<>();
    private final List<ScheduleRecord> schedules = new ArrayList<>();
    private final Map<String, Integer> publicationFates = new LinkedHashMap<>();
    private double endS;
    private RunRecordJournal.Mirror mirror;

    /** @param runStartEpochMs scenario time of t = 0, epoch ms */
    public RunRecord(long runStartEpochMs) {
        this.runStartEpochMs = runStartEpochMs;
    }

    /** Also writes everything recorded from now on into {@code journal} (see {@link RunRecordJournal}). */
    public void mirrorTo(org.loopstand.protocol.journal.JournalWriter journal) {
        mirror = new RunRecordJournal.Mirror(journal, runStartEpochMs);
    }

    private double s(long tMs) {
        return (tMs - runStartEpochMs) / 1000.0;
    }

    /**
     * Samples the physics truth: every area's frequency and net interchange, every tie's flow and every
     * unit's output and load reference.
     */
    public void sampleTruth(double tS, GridSimulator sim) {
        var grid = sim.grid();
        for (int a = 0; a < grid.areas().size(); a++) {
            String id = grid.areas().get(a).id();
            series("frequencyHz/" + id).add(tS, sim.frequencyHz(a));
            series("netInterchangeMw/" + id).add(tS, sim.netInterchangeMw(a));
        }
        for (int t = 0; t < grid.ties().size(); t++) {
            series("tieFlowMw/" + grid.ties().get(t).id()).add(tS, sim.tieFlowMw(t));
        }
        for (int u = 0; u < grid.units().size(); u++) {
            series("outputMw/" + grid.units().get(u).id()).add(tS, sim.outputMw(u));
            // what a setpoint moves; the output adds the governor's primary response on top
            series("loadReferenceMw/" + grid.units().get(u).id()).add(tS, sim.loadReferenceMw(u));
        }
        endS = Math.max(endS, tS);
        if (mirror != null) {
            Map<String, Double> values = new LinkedHashMap<>();
            series.forEach((k, v) -> {
                if (v.size() > 0 && v.timeS(v.size() - 1) == tS) {
                    values.put(k, v.value(v.size() - 1));
                }
            });
            mirror.truthSample(tS, values);
        }
    }

    /** @return the named series (created empty if absent), e.g. {@code frequencyHz/north-basin} */
    public Series series(String key) {
        return series.computeIfAbsent(key, k -> new Series());
    }

    public void event(double atS, String type, String description) {
        events.add(new EventRecord(atS, type, description));
        if (mirror != null) {
            mirror.event(atS, type, description);
        }
    }

    @Override
    public void handled(long nowMs, UnitCommand command, AckOutcome outcome, RefusalReason reason, boolean acted) {
        commandHandled(nowMs, command, outcome, reason, acted);
    }

    /** The unit plant interface's answer to a command (call once per command handed to the unit). */
    public void commandHandled(long receivedMs, UnitCommand command, AckOutcome outcome, RefusalReason reason, boolean acted) {
        add(new CommandRecord(s(receivedMs), command, "handled", outcome, reason, acted));
    }

    void add(CommandRecord c) {
        commands.add(c);
        if (mirror != null) {
            mirror.command(c);
        }
    }

    void add(FaultWindow w) {
        faults.put(w.id(), w);
    }

    /** A new schedule for an area from {@code atS} on (checks judge frequency and ACE against it). */
    public void scheduleChanged(double atS, String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
        schedules.add(new ScheduleRecord(atS, area, scheduledNetInterchangeMw, scheduledFrequencyHz));
    }

    /** @return the schedule of the area in force at {@code tS} (the latest change at or before it), or null for the site's */
    public ScheduleRecord scheduleAt(String area, double tS) {
        ScheduleRecord in = null;
        for (ScheduleRecord r : schedules) {
            if (r.area().equals(area) && r.atS() <= tS + 1e-9) {
                in = r;
            }
        }
        return in;
    }

    public List<ScheduleRecord> schedules() {
        return List.copyOf(schedules);
    }

    public void controllerStatus(long receivedMs, ControllerStatus status) {
        statuses.add(new StatusRecord(s(receivedMs), status));
        if (mirror != null) {
            mirror.status(s(receivedMs), status);
        }
    }

    /**
     * @return commands the units took (accepted), per sending controller id, in id order: in an
     *         insecure run, any id besides the rehearsed controller's is a third party's
     */
    public synchronized java.util.SortedMap<String, Long> acceptedByController() {
        java.util.SortedMap<String, Long> out = new java.util.TreeMap<>();
        for (CommandRecord c : commands) {
            if (c.outcome() == AckOutcome.ACCEPTED && c.command() != null) {
                out.merge(c.command().controllerId(), 1L, Long::sum);
            }
        }
        return out;
    }

    /** Marks the end of the run, s. */
    public void end(double tS) {
        endS = Math.max(endS, tS);
        if (mirror != null) {
            faults.values().forEach(mirror::faultWindow);
            mirror.end(endS);
        }
    }

    @Override
    public void faultStarted(long tMs, FaultSpec spec, String source) {
        faults.put(spec.id(), new FaultWindow(spec.id(), spec.type().name(), spec.type().category().name(),
                spec.targets().stream().map(FaultTarget::id).toList(), s(tMs), Double.POSITIVE_INFINITY));
    }

    @Override
    public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
        FaultWindow w = faults.get(spec.id());
        if (w != null) {
            faults.put(spec.id(), new FaultWindow(w.id(), w.type(), w.category(), w.targets(), w.startS(), s(tMs)));
        }
    }

    @Override
    public void published(long tMs, Publication p) {
        publicationFates.merge(p.fate(), 1, Integer::sum);
    }

    @Override
    public void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
        if (!faultIds.isEmpty() && fate.equals("dropped")) {
            add(new CommandRecord(s(tMs), command, fate, null, null, false));
        }
    }

    public List<FaultWindow> faults() {
        return List.copyOf(faults.values());
    }

    public List<CommandRecord> commands() {
        return List.copyOf(commands);
    }

    public List<StatusRecord> statuses() {
        return List.copyOf(statuses);
    }

    public List<EventRecord> events() {
        return List.copyOf(events);
    }

    /** @return publications by fate (sent, dropped, linkDown …) */
    public Map<String, Integer> publicationFates() {
        return Map.copyOf(publicationFates);
    }

    public double endS() {
        return endS;
    }

    public long runStartEpochMs() {
        return runStartEpochMs;
    }
}
