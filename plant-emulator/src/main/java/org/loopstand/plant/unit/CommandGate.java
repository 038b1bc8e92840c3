package org.loopstand.plant.unit;

import java.util.HashMap;
import java.util.Map;

import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;

/**
 * The refusal rules a unit applies to a decoded command before it may touch the load reference, in
 * this order: wrong unit (malformed), controller not accepted, old epoch, duplicate or out-of-order
 * seq, past validUntil, unit not online, not in remote, kind-specific checks (pulse direction and
 * length, setpoint value, setpoints not taken). The regulating-limit check needs the motion and is done
 * by {@link UnitPlantInterface}.
 *
 * <p>Epochs: the gate keeps the highest epoch seen (from accepted commands and from the controller's
 * status); a command with a lower epoch is refused. A higher epoch starts a new seq history. Seqs are
 * kept per controller id: once a command has passed the seq check its seq is used up, whether or not
 * a later rule refuses it, so a replay is always a duplicate.
 */
public final class CommandGate {
    private final UnitSettings settings;
    private final Map<String, Long> lastSeqByController = new HashMap<>();
    private long highestEpoch = -1;

    public CommandGate(UnitSettings settings) {
        this.settings = settings;
    }

    /** Takes note of a controller's epoch from its status. */
    public void observeEpoch(String controllerId, long epoch) {
        if (settings.acceptedControllers().contains(controllerId)) {
            raiseEpoch(epoch);
        }
    }

    /** @return highest controller epoch seen, −1 before any */
    public long highestEpoch() {
        return highestEpoch;
    }

    /**
     * @param nowEpochMs unit's scenario time, epoch ms
     * @return the refusal, or null when the command may go on to the limit check
     */
    public Refusal check(UnitCommand c, long nowEpochMs, ControlMode mode, UnitStatus status) {
        return check(c, nowEpochMs, mode, status, false);
    }

    /**
     * As {@link #check(UnitCommand, long, ControlMode, UnitStatus)}; with {@code acceptExpired} (a plant
     * fault) a command past validUntil is let through.
     */
    public Refusal check(UnitCommand c, long nowEpochMs, ControlMode mode, UnitStatus status, boolean acceptExpired) {
        if (!c.unit().equals(settings.unitId())) {
            return new Refusal(RefusalReason.MALFORMED, "command is for unit " + c.unit() + ", this is " + settings.unitId());
        }
        if (!settings.acceptedControllers().contains(c.controllerId())) {
            return new Refusal(RefusalReason.WRONG_CONTROLLER, "controller " + c.controllerId()
                    + " is not accepted (accepted: " + settings.acceptedControllers() + ")");
        }
        if (c.epoch() < highestEpoch) {
            return new Refusal(RefusalReason.WRONG_EPOCH, "epoch " + c.epoch() + " is older than " + highestEpoch);
        }
        raiseEpoch(c.epoch());
        Long last = lastSeqByController.get(c.controllerId());
        if (last != null && c.seq() == last) {
            return new Refusal(RefusalReason.DUPLICATE, "seq " + c.seq() + " was already received");
        }
        if (last != null && c.seq() < last) {
            return new Refusal(RefusalReason.OUT_OF_ORDER, "seq " + c.seq() + " is older than the last seq " + last);
        }
        lastSeqByController.put(c.controllerId(), c.seq());
        if (nowEpochMs > c.validUntil() && !acceptExpired) {
            return new Refusal(RefusalReason.EXPIRED, "validUntil " + c.validUntil() + " passed "
                    + (nowEpochMs - c.validUntil()) + " ms ago");
        }
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

    private void raiseEpoch(long epoch) {
        if (epoch > highestEpoch) {
            highestEpoch = epoch;
            lastSeqByController.clear();
        }
    }
}
