package org.loopstand.controller.following;

import java.util.Collections;
import java.util.HashMap;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

/**
 * Checks that units answer their commands.
 *
 * <p>Per unit an <em>expected output</em> moves from the measured output at the first command toward
 * the commanded target ({@code target += Δ} for each command) at the unit's ramp rate, then through
 * a first-order lag of the unit's response lag ({@link #responseLag}). A check
 * compares the measured output with the expected output at {@code t − deadTimeMs}, where t is the
 * source time of the telemetry reading (never later than the check), so a reading that arrives late
 * (a loaded bus, a high replay rate) is judged against what the unit could have done when it was
 * measured. Only a new reading is judged: a check on the same reading as the previous one counts
 * neither way. The shortfall is measured in the direction of the move, so overshoot is not a fault.
 * Failing {@code missedCyclesToFlag} checks in a row flags the unit; it returns after
 * {@code followedCyclesToReturn} passed checks in a row (it caught up with what it was told), after a
 * passed re-admission probe, or on {@link #reset(String)}. Once the whole move is done and checked
 * good, the unit is idle again: its baseline follows the measured output so governor drift is not
 * counted.
 *
 * <p>Governor allowance: the caller passes the output with the steady-state governor share taken
 * out, and how far that share may be off because the turbine's primary response lags the frequency
 * ({@code governorUncertaintyMw}, from the spread of the deviation over the settling window). The
 * uncertainty at the baseline is kept with the track, and so is the largest uncertainty passed since
 * the baseline: a check passes while the shortfall is within {@code toleranceMw + baseline
 * uncertainty + largest uncertainty since the baseline}. Keeping the largest (instead of the present
 * one) covers the whole window of the move: once the settling window has moved past a disturbance,
 * the governor share that was in the baseline is still allowed for. So a unit whose movement is
 * explained by its governor plus its ramp is never flagged; one that does not move at all is flagged
 * as soon as the commanded move exceeds what governor action could explain.
 *
 * <p>Re-admission: {@code probeIntervalMs} of scenario time after a flag the unit is due a probe
 * ({@link #probeDue}); the caller sends a small move and calls {@link #startProbe}, which starts a
 * fresh track. When the unit completes the probe within {@code toleranceMw} it returns
 * ({@code returnedNow}); when it misses {@code missedCyclesToFlag} checks in a row, or has not
 * completed it by its deadline, the probe failed ({@code probeFailedNow}) and the next is due one
 * interval later. Not thread-safe.
 */
public final class UnitFollowingMonitor {
    private final FollowingSettings settings;
    private final Map<String, FollowingTrack> tracks = new HashMap<>();
    private final Map<String, Long> lagMsByUnit = new HashMap<>();

    public UnitFollowingMonitor(FollowingSettings settings) {
        this.settings = settings;
    }

    /**
     * The unit's output lags a ramp of its load reference by {@code lagS} (its servo, turbine and
     * hydro compensation): the expected output is the ramp-limited commanded move passed through a
     * first-order lag of that time constant, then judged {@code deadTimeMs} later. Without it a unit
     * whose response is slower than the dead time (a hydro unit with transient droop compensation:
     * about 40 s) falls behind a pure ramp by its lag times its rate and is flagged although it
     * follows every command. Set before the unit's first command; 0 = no lag.
     */
    public void responseLag(String unitId, double lagS) {
        if (!(lagS >= 0) || !Double.isFinite(lagS)) {
            throw new IllegalArgumentException("responseLag of " + unitId + " must be >= 0 s, was " + lagS);
        }
        lagMsByUnit.put(unitId, Math.round(lagS * 1000));
    }

    private FollowingTrack track(String unitId, double mw, long nowMs) {
        return tracks.computeIfAbsent(unitId, k -> new FollowingTrack(mw, nowMs, lagMsByUnit.getOrDefault(unitId, 0L), settings.deadTimeMs()));
    }

    /** A command was sent: the unit's target moves by {@code deltaMw}. No governor allowance. */
    public void onCommand(String unitId, double deltaMw, long issuedAtMs, double measuredOutputMw) {
        onCommand(unitId, deltaMw, issuedAtMs, measuredOutputMw, 0.0);
    }

    /**
     * A command was sent: the unit's target moves by {@code deltaMw}.
     *
     * @param measuredOutputMw      output with the governor share removed, MW
     * @param governorUncertaintyMw how far that share may be off now, MW, ≥ 0
     */
    public void onCommand(String unitId, double deltaMw, long issuedAtMs, double measuredOutputMw,
                          double governorUncertaintyMw) {
        FollowingTrack t = track(unitId, measuredOutputMw, issuedAtMs);
        if (!t.commanded) {
            t.resync(measuredOutputMw, issuedAtMs);
            t.baselineUncertaintyMw = Math.max(0, governorUncertaintyMw);
            t.largestUncertaintyMw = 0;
        }
        t.commanded = true;
        t.targetMw += deltaMw;
        if (deltaMw != 0) {
            t.lastDirection = Math.signum(deltaMw);
        }
        t.lastCommandMs = issuedAtMs;
    }

    /** One check per unit per cycle, after the unit's telemetry for this cycle is known. No governor allowance. */
    public FollowingCheck check(String unitId, long nowMs, double measuredOutputMw, double rampMwPerMin) {
        return check(unitId, nowMs, measuredOutputMw, rampMwPerMin, 0.0);
    }

    /** A check of a reading taken at the check time ({@link #check(String, long, long, double, double, double)}). */
    public FollowingCheck check(String unitId, long nowMs, double measuredOutputMw, double rampMwPerMin,
                                double governorUncertaintyMw) {
        return check(unitId, nowMs, nowMs, measuredOutputMw, rampMwPerMin, governorUncertaintyMw);
    }

    /**
     * One check per unit per cycle, after the unit's telemetry for this cycle is known.
     *
     * @param nowMs                 time of the check, epoch ms (scenario time)
     * @param readingTimeMs         source time of the telemetry reading, epoch ms; a reading not newer
     *                              than the last one judged is not judged again
     * @param measuredOutputMw      output with the governor share removed, MW
     * @param governorUncertaintyMw how far that share may be off now, MW, ≥ 0
     */
    public FollowingCheck check(String unitId, long nowMs, long readingTimeMs, double measuredOutputMw,
                                double rampMwPerMin, double governorUncertaintyMw) {
        FollowingTrack t = track(unitId, measuredOutputMw, nowMs);
        if (!t.commanded) {
            // nothing asked of the unit: follow its drift (governor action) without judging it
            t.resync(measuredOutputMw, nowMs);
            return new FollowingCheck(unitId, false, measuredOutputMw, measuredOutputMw, 0, true, t.missed, t.flagged,
                    false, false, 0, t.probing, false);
        }
        t.advance(nowMs, rampMwPerMin);
        t.largestUncertaintyMw = Math.max(t.largestUncertaintyMw, Math.max(0, governorUncertaintyMw));
        long judgedAtMs = Math.min(nowMs, readingTimeMs);
        double expectedDelayed = t.expectedAt(judgedAtMs - settings.deadTimeMs());
        double remaining = t.targetMw - expectedDelayed;
        double direction = Math.abs(remaining) > 1e-9 ? Math.signum(remaining) : t.lastDirection;
        double shortfall = direction * (expectedDelayed - measuredOutputMw);
        double allowanceMw = t.baselineUncertaintyMw + t.largestUncertaintyMw;
        boolean following = shortfall <= settings.toleranceMw() + allowanceMw;
        if (judgedAtMs <= t.lastJudgedMs) {
            return new FollowingCheck(unitId, false, expectedDelayed, measuredOutputMw, shortfall, following, t.missed,
                    t.flagged, false, false, allowanceMw, t.probing, false);
        }
        t.lastJudgedMs = judgedAtMs;
        boolean probe = t.probing;
        // with a lag the expected output only approaches the target: done within a tenth of the tolerance
        double doneWithinMw = t.lagMs > 0 ? 0.1 * settings.toleranceMw() : 1e-9;
        boolean done = Math.abs(remaining) <= doneWithinMw && judgedAtMs - t.lastCommandMs > settings.deadTimeMs();
        boolean flaggedNow = false;
        boolean returnedNow = false;
        boolean probeFailedNow = false;
        if (following) {
            t.missed = 0;
            if (t.probing) {
                if (done && shortfall <= settings.toleranceMw()) {
                    t.probing = false;
                    t.flagged = false;
                    returnedNow = true;
                }
            } else if (t.flagged && shortfall > settings.toleranceMw()) {
                t.followed = 0; // back only on its own merit: a pass thanks to the governor allowance is no proof
            } else if (t.flagged && ++t.followed >= settings.followedCyclesToReturn()) {
                t.flagged = false;
                t.followed = 0;
                returnedNow = true;
            }
        } else {
            t.followed = 0;
            if (++t.missed >= settings.missedCyclesToFlag()) {
                if (t.probing) {
                    probeFailedNow = true;
                } else if (!t.flagged) {
                    t.flagged = true;
                    flaggedNow = true;
                    t.nextProbeMs = nowMs + settings.probeIntervalMs();
                }
            }
        }
        if (t.probing && !returnedNow && judgedAtMs > t.probeDeadlineMs) {
            probeFailedNow = true; // a probe is judged strictly: made within the tolerance, in time
        }
        if (probeFailedNow) {
            t.probing = false;
            t.nextProbeMs = nowMs + settings.probeIntervalMs();
        }
        // idle again only when the unit demonstrably got there: a pass thanks to the governor
        // allowance keeps the track (and its baseline) until the unit is within the tolerance itself
        if (done && shortfall <= settings.toleranceMw() && !t.flagged) {
            t.commanded = false;
        }
        return new FollowingCheck(unitId, true, expectedDelayed, measuredOutputMw, shortfall, following, t.missed,
                t.flagged, flaggedNow, returnedNow, allowanceMw, probe, probeFailedNow);
    }

    /**
     * Keeps the unit's target within its regulating limits. The moves summed into the target are reckoned
     * from the unit's last reported setpoint; while that report lags an earlier command a move is counted
     * twice, and at a binding limit the target would climb past what the unit may give: a unit sitting on
     * its limit, as told, would be flagged.
     *
     * @param minMw lowest regulating output, MW
     * @param maxMw highest regulating output, MW, ≥ minMw
     */
    public void limitTarget(String unitId, double minMw, double maxMw) {
        FollowingTrack t = tracks.get(unitId);
        if (t != null && t.commanded && minMw <= maxMw) {
            t.targetMw = Math.max(minMw, Math.min(maxMw, t.targetMw));
        }
    }

    /** @return true when the unit is flagged, no probe is under way and its next probe is due at {@code nowMs} */
    public boolean probeDue(String unitId, long nowMs) {
        FollowingTrack t = tracks.get(unitId);
        return t != null && t.flagged && !t.probing && nowMs >= t.nextProbeMs;
    }

    /**
     * A re-admission probe of {@code deltaMw} was sent to a flagged unit: a fresh track starts from
     * the present output; the unit stays flagged (out of the allocation) until it completes the probe
     * within {@code toleranceMw}. It must do so within {@code 2·deadTimeMs + |Δ|/ramp + 4·lag} of the
     * reading's time, or after {@code missedCyclesToFlag} misses in a row, else the probe failed.
     *
     * @param measuredOutputMw      output with the governor share removed, MW
     * @param governorUncertaintyMw how far that share may be off now, MW, ≥ 0
     * @param rampMwPerMin          the unit's ramp, MW/min, ≥ 0 (0: the dead times alone)
     */
    public void startProbe(String unitId, double deltaMw, long issuedAtMs, double measuredOutputMw,
                           double governorUncertaintyMw, double rampMwPerMin) {
        FollowingTrack t = tracks.get(unitId);
        if (t == null || !t.flagged) {
            throw new IllegalStateException("unit " + unitId + " is not flagged: no probe");
        }
        t.commanded = false;
        t.missed = 0;
        t.followed = 0;
        t.probing = true;
        double moveMs = rampMwPerMin > 0 ? Math.abs(deltaMw) / rampMwPerMin * 60_000.0 : 0;
        // a lagging unit gets four of its time constants more (98 % of the move)
        t.probeDeadlineMs = issuedAtMs + 2 * settings.deadTimeMs() + (long) Math.ceil(moveMs) + 4 * t.lagMs;
        onCommand(unitId, deltaMw, issuedAtMs, measuredOutputMw, governorUncertaintyMw);
    }

    /** @return true when no move of the unit is being tracked (its next command starts a new baseline) */
    public boolean idle(String unitId) {
        FollowingTrack t = tracks.get(unitId);
        return t == null || !t.commanded;
    }

    /**
     * Corrects the baseline of the move under way by {@code deltaMw}, e.g. once the frequency valid
     * at the baseline's reading is known: the expected output and the target move with it.
     */
    public void rebase(String unitId, double deltaMw) {
        FollowingTrack t = tracks.get(unitId);
        if (t != null && t.commanded && Double.isFinite(deltaMw)) {
            t.shift(deltaMw);
        }
    }

    /**
     * A command counted by {@link #onCommand} did not reach the unit or was refused: its move is
     * taken back from the target, so the unit is not judged on a move it never got.
     */
    public void withdraw(String unitId, double deltaMw) {
        FollowingTrack t = tracks.get(unitId);
        if (t != null && t.commanded && Double.isFinite(deltaMw)) {
            t.targetMw -= deltaMw;
        }
    }

    /**
     * Flags the unit for a reason found outside the check (e.g. its commands keep failing to land);
     * the first probe is due {@code probeIntervalMs} later.
     *
     * @return true when the unit was not flagged before
     */
    public boolean flag(String unitId, long nowMs, double outputMw) {
        FollowingTrack t = track(unitId, outputMw, nowMs);
        if (t.flagged) {
            return false;
        }
        t.flagged = true;
        t.probing = false;
        t.nextProbeMs = nowMs + settings.probeIntervalMs();
        return true;
    }

    /** Operator reset: the unit returns to the allocation and its history is forgotten. */
    public void reset(String unitId) {
        tracks.remove(unitId);
    }

    public boolean flagged(String unitId) {
        FollowingTrack t = tracks.get(unitId);
        return t != null && t.flagged;
    }

    /** @return ids of flagged units, sorted */
    public Set<String> flaggedUnits() {
        Set<String> out = new TreeSet<>();
        tracks.forEach((id, t) -> {
            if (t.flagged) {
                out.add(id);
            }
        });
        return Collections.unmodifiableSet(out);
    }
}
