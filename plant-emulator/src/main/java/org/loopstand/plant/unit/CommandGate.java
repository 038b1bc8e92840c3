package org.loopstand.plant.unit;

import java.util.HashMap;
import java.util.Map;

import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.security.CommandTimeRules;
import org.loopstand.protocol.security.VerificationResult;

/**
 * The refusal rules a unit applies to a decoded command before it may touch the load reference, in
 * this order: wrong unit (malformed), controller not accepted, epoch beyond its bound, standby
 * controller or old epoch ({@link ControllerTenure}), duplicate or out-of-order seq, lifetime bound
 * and issue time ({@link CommandTimeRules}), past validUntil, unit not online, not in remote,
 * kind-specific checks (pulse direction and length, setpoint value, setpoints not taken). The
 * regulating-limit check needs the motion and is done by {@link UnitPlantInterface}.
 *
 * <p>Epochs: only a command that passed every message check (up to expiry) adopts its epoch (a new
 * epoch starts that controller's seq history afresh); a refused one (expired, too long a lifetime,
 * an epoch from the future) leaves the epoch and the seq history as they were, so it cannot fence
 * the unit. Seqs are kept per controller id: within the current epoch, once a command has passed
 * the seq check its seq is used up, whether or not a later rule refuses it, so a replay is always
 * a duplicate; a refused command more than {@value #MAX_SEQ_STEP} ahead of the last seq, or the
 * first of a history, does not move it.
 */
public final class CommandGate {
    /**
     * Largest seq step a command refused later (expired, lifetime, issue time) may still use up; a
     * refused command further ahead leaves the seq history alone, so one stale message with seq + 10^9
     * cannot make every later real command "out of order".
     */
    static final long MAX_SEQ_STEP = 1_000;

    /**
     * Refusals decided before the expiry rule in the order above (the signature, checked before the gate,
     * included): an expired command refused for one of these was not let through, it met an earlier rule.
     */
    public static final java.util.Set<RefusalReason> DECIDED_BEFORE_EXPIRY = java.util.Collections.unmodifiableSet(
            java.util.EnumSet.of(RefusalReason.WRONG_CONTROLLER, RefusalReason.WRONG_EPOCH, RefusalReason.DUPLICATE,
                    RefusalReason.OUT_OF_ORDER, RefusalReason.BAD_LIFETIME, RefusalReason.NOT_YET_VALID,
                    RefusalReason.BAD_SIGNATURE, RefusalReason.MISSING_SIGNATURE, RefusalReason.UNKNOWN_KEY,
                    RefusalReason.REPLAYED));

    private final UnitSettings settings;
    private final ControllerTenure tenure;
    private final Map<String, Long> lastSeqByController = new HashMap<>();

    public CommandGate(UnitSettings settings) {
        this.settings = settings;
        this.tenure = new ControllerTenure(settings.watchdogS());
    }

    /** The holder of this unit and each controller's epoch (shared with the status handling). */
    ControllerTenure tenure() {
        return tenure;
    }

    /** Adopts a checked status's epoch; a new epoch starts that controller's seq history afresh. */
    void adoptStatusEpoch(String controllerId, long epoch, long nowNanos) {
        if (tenure.adopt(controllerId, epoch, nowNanos)) {
            lastSeqByController.remove(controllerId);
        }
    }

    /**
     * @param nowEpochMs unit's scenario time, epoch ms
     * @return the refusal, or null when the command may go on to the limit check
     */
    public Refusal check(UnitCommand c, long nowEpochMs, ControlMode mode, UnitStatus status) {
        return check(c, nowEpochMs, mode, status, false);
    }

    /** As {@link #check(UnitCommand, long, ControlMode, UnitStatus, boolean, long)} at monotonic time 0. */
    public Refusal check(UnitCommand c, long nowEpochMs, ControlMode mode, UnitStatus status, boolean acceptExpired) {
        return check(c, nowEpochMs, mode, status, acceptExpired, 0L);
    }

    /**
     * As {@link #check(UnitCommand, long, ControlMode, UnitStatus)}; with {@code acceptExpired} (a plant
     * fault) a command past validUntil is let through.
     *
     * @param nowNanos unit's monotonic clock, ns (the tenure's watchdog period)
     */
    public Refusal check(UnitCommand c, long nowEpochMs, ControlMode mode, UnitStatus status, boolean acceptExpired,
                         long nowNanos) {
        if (!c.unit().equals(settings.unitId())) {
            return new Refusal(RefusalReason.MALFORMED, "command is for unit " + c.unit() + ", this is " + settings.unitId());
        }
        if (!settings.acceptedControllers().contains(c.controllerId())) {
            return new Refusal(RefusalReason.WRONG_CONTROLLER, "controller " + c.controllerId()
                    + " is not accepted (accepted: " + settings.acceptedControllers() + ")");
        }
        Refusal held = tenure.check(c.controllerId(), c.epoch(), nowEpochMs, nowNanos);
        if (held != null) {
            return held;
        }
        boolean sameEpoch = c.epoch() == tenure.storedEpochOf(c.controllerId());
        Long last = sameEpoch ? lastSeqByController.get(c.controllerId()) : null;
        if (last != null && c.seq() == last) {
            return new Refusal(RefusalReason.DUPLICATE, "seq " + c.seq() + " was already received");
        }
        if (last != null && c.seq() < last) {
            return new Refusal(RefusalReason.OUT_OF_ORDER, "seq " + c.seq() + " is older than the last seq " + last);
        }
        if (sameEpoch && last != null && c.seq() - last <= MAX_SEQ_STEP) {
            lastSeqByController.put(c.controllerId(), c.seq()); // used up: a replay is a duplicate
        }
        VerificationResult timing = CommandTimeRules.check(c, nowEpochMs);
        if (timing != null) {
            return new Refusal(timing.reason(), timing.detail());
        }
        if (nowEpochMs > c.validUntil() && !acceptExpired) {
            long agoMs = nowEpochMs - c.validUntil();
            // far in the past usually means a wall-clock stamp in an accelerated run: say what the time base is
            return new Refusal(RefusalReason.EXPIRED, "validUntil " + c.validUntil() + " passed " + agoMs + " ms ago"
                    + (agoMs > CommandTimeRules.MAX_LIFETIME_MS ? "; every time on the bus is scenario epoch ms (the clock"
                    + " topic's sourceTime), not the wall clock" : ""));
        }
        if (tenure.adopt(c.controllerId(), c.epoch(), nowNanos)) {
            lastSeqByController.remove(c.controllerId());
        }
        lastSeqByController.put(c.controllerId(), c.seq()); // a command that passed every message check
        if (status != UnitStatus.ONLINE) {
            return new Refusal(RefusalReason.UNIT_OFFLINE, "unit is " + status.wireName());
        }
        if (mode != ControlMode.REMOTE) {
            return new Refusal(RefusalReason.NOT_IN_REMOTE, "unit is in " + mode.wireName() + " mode");
        }
        if (c.kind() == CommandKind.PULSE) {
            if (c.direction() == null) {
                return new Refusal(RefusalReason.MALFORMED, "pulse without a direction");
            }
            if (c.durationMs() < 1) {
                return new Refusal(RefusalReason.MALFORMED, "pulse durationMs must be at least 1, got " + c.durationMs());
            }
            if (c.durationMs() > settings.maxPulseMs()) {
                return new Refusal(RefusalReason.PULSE_TOO_LONG, "pulse of " + c.durationMs()
                        + " ms is longer than this unit's maximum " + settings.maxPulseMs() + " ms");
            }
        } else {
            if (c.setpointMw() == null || !Double.isFinite(c.setpointMw())) {
                return new Refusal(RefusalReason.MALFORMED, "setpoint command without a finite setpointMw");
            }
            if (!settings.acceptsSetpoints()) {
                // No closer reason in the contract: the command is not one this unit's interface speaks.
                return new Refusal(RefusalReason.MALFORMED, "this unit takes raise/lower pulses only, no setpoints");
            }
        }
        return null;
    }

}
