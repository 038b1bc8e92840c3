package org.loopstand.plant.check;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;

/**
 * Whether a controller resumes without a bump: after it regulates an area again (from a suspension, or
 * after a silence in its status such as a node loss or a partition), what its first commands ask of the
 * area's units is no more than the area's ACE at that moment calls for. Bumpless transfer is a standard
 * rule of controller switching (from memory: Åström and Hägglund, Advanced PID Control, 2006, "bumpless
 * transfer"); the bound by the ACE is common practice, no source. A status that only says the plant's
 * scenario time stands still ({@value #WAITING_FOR_CLOCK}: the pace keeper holds the clock) hands nothing
 * over and is not a suspension here; a silence of the status still is.
 */
final class ResumeChecks {
    private ResumeChecks() {
    }

    /** What the first commands after a resume asked: their number and the change, MW. */
    private record Asked(int commands, double mw) {
    }

    /**
     * One area taken up again by a controller at {@code atS} (its own clock, scenario s); its commands count
     * from after {@code fromS}: the area's last status before the resume when that one held it (the controller
     * sends a held area nothing, and the cycle that resumes sends its commands before it publishes the status
     * saying so: 0.4 s of scenario time earlier at rate 40, at the same instant in lockstep), else from {@code atS}.
     */
    record Resume(String controller, String area, double atS, String after, double fromS) {
    }

    /**
     * For each resume of the area ({@code *} = every area): the change asked of the area's units by
     * commands issued before resume + windowS and after the status before it that held the area (after a
     * silence: from the resume; see {@link Resume}) — a pulse asks ± its length × the unit's pulse rate,
     * the last setpoint to a unit asks its distance from the unit's truth load reference before the resume
     * (or before the first of those setpoints reached the unit, if earlier) — must lie
     * between 0 and −ACE (truth ACE at the resume: a positive ACE calls for lowering), widened by
     * toleranceMw. The figure is the worst excess beyond that range, MW. No resume: fails, nothing to judge.
     */
    static CheckOutcome noBumpAfterResume(CheckSpec spec, RunRecord run, Grid grid) {
        String area = spec.text("area");
        double windowS = spec.number("windowS");
        double toleranceMw = spec.number("toleranceMw");
        List<Resume> resumes = resumes(run, area, spec.number("gapS"));
        if (resumes.isEmpty()) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "MW", toleranceMw, "no controller resumed regulating "
                    + (area.equals("*") ? "any area" : area) + " after a suspension or a silence of its status ("
                    + run.statuses().size() + " statuses received): nothing to judge", true);
        }
        double worstMw = 0;
        List<String> seen = new ArrayList<>();
        for (Resume r : resumes) {
            double aceMw = truthAceAt(run, grid, r.area(), r.atS());
            Asked asked = asked(run, grid, r, windowS);
            double askedMw = asked.mw();
            double calledForMw = -aceMw;
            double excessMw = Math.max(0, Math.max(askedMw - Math.max(0, calledForMw), Math.min(0, calledForMw) - askedMw));
            worstMw = Math.max(worstMw, excessMw);
            seen.add(String.format(Locale.ROOT, "%s %s at %.1f s after %s: %d commands asked %+.1f MW in %.0f s, ACE %+.1f MW"
                    + " calls for %+.1f MW (excess %.1f MW)", r.controller(), r.area(), r.atS(), r.after(), asked.commands(),
                    askedMw, windowS, aceMw, calledForMw, excessMw));
        }
        return new CheckOutcome(spec.name(), worstMw <= toleranceMw, worstMw, "MW", toleranceMw,
                resumes.size() + " resume(s): " + String.join("; ", seen), true);
    }

    /** @return every moment a controller took an area up again, in time order */
    static List<Resume> resumes(RunRecord run, String area, double gapS) {
        // in the order each controller process published them (seq per epoch): statuses queued at a broker
        // during a partition arrive late and out of order with the others
        Map<String, List<ControllerStatus>> byController = new LinkedHashMap<>();
        for (RunRecord.StatusRecord s : run.statuses()) {
            byController.computeIfAbsent(s.status().controllerId() + "@" + s.status().epoch(), k -> new ArrayList<>())
                    .add(s.status());
        }
        List<Resume> out = new ArrayList<>();
        for (List<ControllerStatus> list : byController.values()) {
            list.sort(Comparator.comparingLong(ControllerStatus::seq));
            Map<String, Double> lastRegulatedAtS = new HashMap<>();
            Map<String, String> heldBy = new HashMap<>();
            Map<String, Double> heldAtS = new HashMap<>();
            double previousS = Double.NaN;
            java.util.Set<String> known = new java.util.LinkedHashSet<>();
            for (ControllerStatus s : list) {
                if (heldClock(s)) {
                    // the plant held scenario time (pace keeper, or before the go): no control was handed over,
                    // the controller takes up where it stood when time runs on
                    continue;
                }
                double atS = (s.sourceTime() - run.runStartEpochMs()) / 1000.0;
                boolean silence = !Double.isNaN(previousS) && atS - previousS > gapS;
                List<String> areas = areasOf(s);
                known.addAll(areas);
                if (s.state() != ControllerState.REGULATING) {
                    known.stream().filter(a -> !areas.contains(a)).forEach(areas::add); // a status without its areas holds all
                }
                for (String a : areas) {
                    if (!area.equals("*") && !area.equals(a)) {
                        continue;
                    }
                    boolean regulated = s.state() == ControllerState.REGULATING && (s.suspendedAreas() == null
                            || s.suspendedAreas().stream().noneMatch(x -> x.area().equals(a)));
                    if (!regulated) {
                        heldBy.put(a, s.state() == ControllerState.REGULATING ? "suspension " + reasonsOf(s, a)
                                : s.state().wireName() + " " + reasonsOf(s, a));
                        // not before its last regulating status: a last will carries the time the connection was made
                        heldAtS.put(a, Math.max(atS, lastRegulatedAtS.getOrDefault(a, Double.NEGATIVE_INFINITY)));
                    } else if (heldBy.containsKey(a)) {
                        out.add(new Resume(s.controllerId(), a, atS, heldBy.remove(a), Math.min(atS, heldAtS.get(a))));
                    } else if (silence && lastRegulatedAtS.containsKey(a)) {
                        out.add(new Resume(s.controllerId(), a, atS,
                                String.format(Locale.ROOT, "%.0f s without status", atS - previousS), atS));
                    }
                    if (regulated) {
                        lastRegulatedAtS.put(a, atS);
                    }
                }
                previousS = atS;
            }
        }
        out.sort(Comparator.comparingDouble(Resume::atS));
        return out;
    }

    /** Reason a controller gives while the plant's scenario time stands still (docs/controller.md). */
    static final String WAITING_FOR_CLOCK = "waitingForClock";

    /** @return true for a status that says only that scenario time stands still */
    private static boolean heldClock(ControllerStatus s) {
        return s.state() == ControllerState.SUSPENDED && s.reasons().equals(List.of(WAITING_FOR_CLOCK))
                && (s.suspendedAreas() == null || s.suspendedAreas().isEmpty());
    }

    private static List<String> areasOf(ControllerStatus s) {
        List<String> areas = new ArrayList<>();
        if (s.areas() != null) {
            s.areas().forEach(a -> areas.add(a.area()));
        }
        if (s.suspendedAreas() != null) {
            s.suspendedAreas().stream().map(x -> x.area()).filter(a -> !areas.contains(a)).forEach(areas::add);
        }
        return areas;
    }

    private static String reasonsOf(ControllerStatus s, String area) {
        if (s.suspendedAreas() != null) {
            for (var x : s.suspendedAreas()) {
                if (x.area().equals(area)) {
                    return x.reasons().toString();
                }
            }
        }
        return s.reasons() == null ? "[]" : s.reasons().toString();
    }

    private static Asked asked(RunRecord run, Grid grid, Resume r, double windowS) {
        int counted = 0;
        Map<String, GeneratingUnit> units = new HashMap<>();
        grid.units().stream().filter(u -> u.area().equals(r.area())).forEach(u -> units.put(u.id(), u));
        double pulsesMw = 0;
        Map<String, Double> lastSetpointMw = new LinkedHashMap<>();
        Map<String, Double> firstReceivedS = new HashMap<>();
        java.util.Set<String> once = new java.util.HashSet<>(); // a command that reached the unit twice asks once
        for (RunRecord.CommandRecord c : run.commands()) {
            UnitCommand cmd = c.command();
            GeneratingUnit u = units.get(cmd.unit());
            double issuedS = (cmd.issuedAt() - run.runStartEpochMs()) / 1000.0;
            boolean inWindow = (issuedS > r.fromS() || issuedS >= r.atS()) && issuedS < r.atS() + windowS;
            if (u == null || !inWindow || !cmd.controllerId().equals(r.controller()) || !once.add(cmd.unit() + "#" + cmd.seq())) {
                continue;
            }
            counted++;
            if (cmd.kind() == CommandKind.PULSE) {
                double mw = cmd.durationMs() / 60_000.0 * u.pulseRateMwPerMin();
                pulsesMw += cmd.direction() == PulseDirection.RAISE ? mw : -mw;
            } else if (cmd.kind() == CommandKind.SETPOINT && cmd.setpointMw() != null) {
                lastSetpointMw.put(u.id(), cmd.setpointMw());
                firstReceivedS.merge(u.id(), c.receivedS(), Math::min);
            }
        }
        double setpointsMw = 0;
        for (Map.Entry<String, Double> e : lastSetpointMw.entrySet()) {
            // before the resume's commands reached the unit: the controller's clock may run ahead of the plant's
            double beforeS = Math.min(r.atS(), firstReceivedS.get(e.getKey()));
            setpointsMw += e.getValue() - loadReferenceBefore(run, e.getKey(), beforeS);
        }
        return new Asked(counted, pulsesMw + setpointsMw);
    }

    /**
     * @return the unit's truth load reference at the last sample before {@code beforeS}, MW: a setpoint
     *         moves the load reference, while the output also carries the governor's primary response to
     *         the frequency (a resume right after a load step would otherwise count that response, tens of
     *         MW, as a lowering asked). A record without load references (read from an older journal)
     *         falls back to the output.
     */
    private static double loadReferenceBefore(RunRecord run, String unit, double beforeS) {
        RunRecord.Series ref = run.series("loadReferenceMw/" + unit);
        return valueBefore(ref.size() > 0 ? ref : run.series("outputMw/" + unit), beforeS);
    }

    /** @return the last sample strictly before {@code tS} (the first one if none is), NaN for an empty series */
    private static double valueBefore(RunRecord.Series s, double tS) {
        double v = Double.NaN;
        for (int i = 0; i < s.size(); i++) {
            if (s.timeS(i) >= tS && !Double.isNaN(v)) {
                break;
            }
            v = s.value(i);
        }
        return v;
    }

    private static double truthAceAt(RunRecord run, Grid grid, String area, double atS) {
        return valueAt(TruthAce.of(run, grid, area), atS);
    }

    /** @return the last sample at or before {@code atS} (the first one if none is), NaN for an empty series */
    private static double valueAt(RunRecord.Series s, double atS) {
        double v = Double.NaN;
        for (int i = 0; i < s.size(); i++) {
            if (s.timeS(i) > atS && !Double.isNaN(v)) {
                break;
            }
            v = s.value(i);
        }
        return v;
    }
}
