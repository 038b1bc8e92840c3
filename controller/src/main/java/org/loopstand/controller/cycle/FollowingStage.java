package org.loopstand.controller.cycle;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.OptionalDouble;
import java.util.Set;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.following.FollowingCheck;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.controller.following.FrequencyHistory;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.following.UnitFollowingMonitor;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseOutcome;
import org.loopstand.controller.pulse.PulsePlanner;

/**
 * The unit-following part of the cycle: pairs each unit's output with its area's frequency at the
 * same instant (both by source time), removes the governor share, runs the checks, sends
 * re-admission probes to flagged units and turns every exclusion, probe and re-admission into a
 * {@link FollowingDecision}. Not thread-safe: one cycle thread.
 */
final class FollowingStage {
    private final ControlCycleSettings settings;
    private final UnitFollowingMonitor monitor;
    private final Map<String, FrequencyHistory> frequencyHistory = new HashMap<>();
    /** baselines taken before the frequency valid at their reading was known */
    private final Map<String, PendingBaseline> pending = new HashMap<>();

    private record PendingBaseline(String areaId, long readingTimeMs, double outputMw, double correctedMw,
                                   GovernorResponse governor) {
    }

    FollowingStage(ControlCycleSettings settings) {
        this.settings = settings;
        this.monitor = new UnitFollowingMonitor(settings.following());
        settings.governors().forEach((unitId, g) -> monitor.responseLag(unitId, g.responseLagS()));
        for (AreaSetup a : settings.areas()) {
            frequencyHistory.put(a.ace().areaId(), new FrequencyHistory(settings.following().governorSettleMs()));
        }
    }

    /** A usable frequency reading of an area: deviation f − Fs, Hz, measured at {@code sourceTimeMs}. */
    void recordFrequency(String areaId, long sourceTimeMs, double dfHz) {
        frequencyHistory.get(areaId).add(sourceTimeMs, dfHz);
    }

    /**
     * Checks every unit with good telemetry whose area had a usable frequency this cycle.
     *
     * @param areasWithFrequency areas whose frequency was usable this cycle
     * @param decisions          receives exclusions and re-admissions
     */
    List<FollowingCheck> check(List<UnitState> units, Set<String> areasWithFrequency, long nowMs,
                               List<FollowingDecision> decisions) {
        settlePendingBaselines();
        List<FollowingCheck> checks = new ArrayList<>();
        for (UnitState u : units) {
            // judged only with a good frequency, so the governor share can be taken out
            if (u.telemetryGood() && u.online() && areasWithFrequency.contains(u.areaId())) {
                FollowingCheck c = monitor.check(u.unitId(), nowMs, u.telemetryTimeMs(), responseMw(u),
                        u.rampMwPerMin(), governorUncertaintyMw(u));
                checks.add(c);
                FollowingDecision d = FollowingDecision.of(c, u.areaId());
                if (d != null) {
                    decisions.add(d);
                }
            }
        }
        return checks;
    }

    Set<String> flaggedUnits() {
        return monitor.flaggedUnits();
    }

    /** A command went out to a unit in the allocation. */
    void onCommand(UnitState u, PlannedCommand c, long nowMs) {
        boolean newBaseline = monitor.idle(u.unitId());
        double corrected = responseMw(u);
        monitor.onCommand(u.unitId(), c.deltaMw(), nowMs, corrected, governorUncertaintyMw(u));
        monitor.limitTarget(u.unitId(), u.regulatingMinMw(), u.regulatingMaxMw());
        if (newBaseline) {
            awaitFrequencyAt(u, corrected);
        }
    }

    /**
     * The frequency valid at the baseline's reading has not arrived yet (the meter scans later than
     * the unit): the baseline was taken with the latest deviation and is corrected once it is known.
     */
    private void awaitFrequencyAt(UnitState u, double correctedMw) {
        pending.remove(u.unitId());
        FrequencyHistory h = frequencyHistory.get(u.areaId());
        if (h != null && h.dfAt(u.telemetryTimeMs()).isEmpty()) {
            pending.put(u.unitId(), new PendingBaseline(u.areaId(), u.telemetryTimeMs(), u.outputMw(), correctedMw,
                    governor(u)));
        }
    }

    private void settlePendingBaselines() {
        pending.entrySet().removeIf(e -> {
            PendingBaseline p = e.getValue();
            OptionalDouble df = frequencyHistory.get(p.areaId()).dfAt(p.readingTimeMs());
            if (df.isEmpty()) {
                return false;
            }
            monitor.rebase(e.getKey(), p.outputMw() - p.governor().shareMw(df.getAsDouble()) - p.correctedMw());
            return true;
        });
    }

    /**
     * Probes for the flagged units of one area that are due one and could take a command (online,
     * in remote, telemetry good): a move of {@code probeMw} in the direction that helps the ACE
     * (toward the middle of the unit's range when the ACE gives none), turned the other way when
     * the unit has no room for it.
     *
     * @param filteredAceMw the area's filtered ACE, MW, or NaN when unknown
     * @return the probe commands to send
     */
    List<PlannedCommand> probes(List<UnitState> areaUnits, double filteredAceMw, long nowMs, PulsePlanner pulses,
                                List<FollowingDecision> decisions) {
        List<PlannedCommand> out = new ArrayList<>();
        double sizeMw = settings.following().probeMw();
        for (UnitState u : areaUnits) {
            if (!u.online() || !u.inRemote() || !u.telemetryGood() || !monitor.probeDue(u.unitId(), nowMs)) {
                continue;
            }
            double mid = (u.regulatingMinMw() + u.regulatingMaxMw()) / 2;
            double direction = Double.isFinite(filteredAceMw) && filteredAceMw != 0 ? -Math.signum(filteredAceMw)
                    : (u.setpointMw() <= mid ? 1 : -1);
            if (u.setpointMw() + direction * sizeMw > u.regulatingMaxMw()
                    || u.setpointMw() + direction * sizeMw < u.regulatingMinMw()) {
                direction = -direction;
            }
            double target = Math.max(u.regulatingMinMw(), Math.min(u.regulatingMaxMw(),
                    u.setpointMw() + direction * sizeMw));
            PulseOutcome p = pulses.plan(u, target, nowMs, settings.cycleMs());
            if (p.sends()) {
                PlannedCommand c = p.command();
                out.add(c);
                monitor.startProbe(u.unitId(), c.deltaMw(), nowMs, responseMw(u), governorUncertaintyMw(u),
                        u.rampMwPerMin());
                awaitFrequencyAt(u, responseMw(u));
                decisions.add(FollowingDecision.probeSent(u.unitId(), u.areaId(), responseMw(u), c.deltaMw()));
            }
        }
        return out;
    }

    /** A command counted as sent did not land: the unit is not judged on its move. */
    void withdraw(String unitId, double deltaMw) {
        monitor.withdraw(unitId, deltaMw);
    }

    /**
     * The unit's commands keep failing to land ({@code missedCyclesToFlag} in a row): it leaves the
     * allocation like a unit that does not follow, with reason {@code commandsNotExecuted:{last
     * reason}}, and comes back through a probe.
     *
     * @return the exclusion, or null when the unit was excluded already
     */
    FollowingDecision excludeForFailedCommands(String unitId, String areaId, long nowMs, int failedInRow,
                                               String lastReason) {
        if (!monitor.flag(unitId, nowMs, Double.NaN)) {
            return null;
        }
        return new FollowingDecision(unitId, areaId, FollowingDecision.EXCLUDED, "commandsNotExecuted:" + lastReason,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN, failedInRow, 0);
    }

    void reset(String unitId) {
        pending.remove(unitId);
        monitor.reset(unitId);
    }

    /**
     * Output with the steady-state governor share (−K·Δf beyond the dead band) removed, MW; Δf is
     * the area's deviation valid at the source time of the unit's reading (the latest one when the
     * meter has not reported that recently yet), so a stale frequency reading just after a step is
     * not paired with an output that already answered it.
     */
    private double responseMw(UnitState u) {
        FrequencyHistory h = frequencyHistory.get(u.areaId());
        if (h == null) {
            return u.outputMw();
        }
        OptionalDouble df = h.dfAt(u.telemetryTimeMs());
        return u.outputMw() - governor(u).shareMw(df.isPresent() ? df.getAsDouble() : h.latest().orElse(0.0));
    }

    /**
     * How far the governor share may be from its steady-state value because the turbine lags: the
     * spread of the share over the deviations of the settling window, MW.
     */
    private double governorUncertaintyMw(UnitState u) {
        FrequencyHistory h = frequencyHistory.get(u.areaId());
        if (h == null) {
            return 0.0;
        }
        double[] range = h.range();
        return governor(u).spanMw(range[0], range[1]);
    }

    private GovernorResponse governor(UnitState u) {
        return settings.governors().getOrDefault(u.unitId(), GovernorResponse.NONE);
    }
}
