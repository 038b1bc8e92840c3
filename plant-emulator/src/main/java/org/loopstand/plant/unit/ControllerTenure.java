package org.loopstand.plant.unit;

import java.util.HashMap;
import java.util.Map;

import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.security.CommandTimeRules;

/**
 * Which controller holds a unit, and the epoch of each controller id, as one unit sees them.
 *
 * <p><b>Epochs</b> are kept per controller id (epoch ms, see {@link CommandTimeRules}). An epoch is
 * adopted only from a command or status that passed every check (signature where keys are
 * configured, expiry, lifetime bound, topic/id match, epoch bound); a refused message never moves
 * it. A lower epoch of the same id is then refused ({@code wrongEpoch}) — the fence after a
 * restart or a session takeover of the same id. An adopted epoch <em>lapses</em> when nothing with it
 * has been heard for the watchdog period: the next valid epoch of that id is then adopted even if
 * lower, so one message can never fence an id for longer than the watchdog.
 *
 * <p><b>Active and standby</b>: the unit follows one controller at a time, the first accepted
 * controller heard with a valid status. While it is alive (heard within the watchdog period and not
 * offline) another accepted controller that announces itself with statuses is a standby: its
 * statuses are not taken as heartbeats and its commands are refused ({@code wrongController},
 * "standby"). When the active one reports offline or falls silent for the watchdog period, the next
 * controller heard takes over. An accepted sender that never publishes a status (an operator desk,
 * the unit response test) is no controller of the unit: its commands are taken on their own checks
 * and never make it the active one. Owner thread only.
 */
final class ControllerTenure {
    private record Held(long epoch, long heardNanos) {
    }

    /** Most controller ids remembered; more (a flood of invented ids) starts the memory afresh. */
    private static final int MAX_IDS = 64;

    private final long watchdogNanos;
    private final Map<String, Held> byController = new HashMap<>();
    private final java.util.Set<String> announced = new java.util.HashSet<>();
    private String active;
    private long activeHeardNanos;

    ControllerTenure(double watchdogS) {
        this.watchdogNanos = Math.round(watchdogS * 1e9);
    }

    /** @return the controller the unit follows now, or null */
    String active(long nowNanos) {
        return alive(nowNanos) ? active : null;
    }

    /** @return highest live epoch of that controller id, −1 when none */
    long epochOf(String controllerId, long nowNanos) {
        Held h = byController.get(controllerId);
        return h == null || nowNanos - h.heardNanos() > watchdogNanos ? -1 : h.epoch();
    }

    /** @return the last epoch adopted from that id, live or lapsed, −1 when none */
    long storedEpochOf(String controllerId) {
        Held h = byController.get(controllerId);
        return h == null ? -1 : h.epoch();
    }

    /**
     * The epoch and standby checks of a command or status, adopting nothing.
     *
     * @return the refusal, or null when the message may go on to its other checks
     */
    Refusal check(String controllerId, long epoch, long nowMs, long nowNanos) {
        if (!CommandTimeRules.epochWithinBound(epoch, nowMs)) {
            return new Refusal(RefusalReason.NOT_YET_VALID, CommandTimeRules.epochDetail(epoch, nowMs));
        }
        if (alive(nowNanos) && !active.equals(controllerId) && announced.contains(controllerId)) {
            return new Refusal(RefusalReason.WRONG_CONTROLLER, "standby: controller " + active
                    + " holds this unit (heard " + (nowNanos - activeHeardNanos) / 1_000_000 + " ms ago)");
        }
        long held = epochOf(controllerId, nowNanos);
        if (epoch < held) {
            return new Refusal(RefusalReason.WRONG_EPOCH, "epoch " + epoch + " is older than " + held
                    + " of controller " + controllerId);
        }
        return null;
    }

    /**
     * Notes a controller that announces itself with statuses (authentic ones: called after the
     * topic, acceptance and signature checks): only such a one can be active or standby.
     */
    void announce(String controllerId) {
        if (announced.size() >= MAX_IDS) {
            announced.clear();
        }
        announced.add(controllerId);
    }

    /**
     * Adopts the epoch of a message that passed every check and makes its controller the active
     * one when none is alive and it announces itself with statuses.
     *
     * @return true when this is a new epoch for that id (its seq history starts afresh)
     */
    boolean adopt(String controllerId, long epoch, long nowNanos) {
        Held before = byController.get(controllerId);
        long held = epochOf(controllerId, nowNanos);
        if (byController.size() >= MAX_IDS && before == null) {
            byController.clear();
        }
        byController.put(controllerId, new Held(Math.max(epoch, held), nowNanos));
        if (announced.contains(controllerId) && (!alive(nowNanos) || active.equals(controllerId))) {
            active = controllerId;
            activeHeardNanos = nowNanos;
        }
        return before == null || epoch != before.epoch();
    }

    /** The active controller said it is offline: the unit is free for the next one. */
    void release(String controllerId) {
        if (controllerId.equals(active)) {
            active = null;
        }
    }

    private boolean alive(long nowNanos) {
        return active != null && nowNanos - activeHeardNanos <= watchdogNanos;
    }
}
