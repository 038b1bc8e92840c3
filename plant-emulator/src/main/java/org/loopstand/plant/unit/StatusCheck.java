package org.loopstand.plant.unit;

import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.security.VerificationResult;

/**
 * The checks a controller status must pass before a unit takes it as a heartbeat or adopts its
 * epoch, first failure decides, each with its reason code:
 * <ol>
 * <li>{@code wrongTopic}: the status's controllerId is not the one in its topic
 *     ({@code .../controller/{id}/status});</li>
 * <li>{@code notAccepted}: the controller id is not one this unit takes commands from;</li>
 * <li>{@code missingSignature}, {@code unknownKey}, {@code badSignature}: the keys file holds a
 *     status key for that controller and the status is not signed with it ({@link StatusSeal});</li>
 * <li>{@code epochAhead}: the epoch is beyond its bound; {@code standby}: another controller holds
 *     the unit; {@code olderEpoch}: below the live epoch of that id ({@link ControllerTenure}).</li>
 * </ol>
 */
final class StatusCheck {
    /** Why a status was not taken: a reason code and a sentence. */
    record StatusRefusal(String code, String detail) {
    }

    private final UnitSettings settings;
    private final ControllerTenure tenure;
    private final PlantJournal journal;
    private StatusSeal seal;
    private volatile long refusals;
    private String lastJournaledKey;
    private long lastJournaledNanos;

    StatusCheck(UnitSettings settings, ControllerTenure tenure, PlantJournal journal) {
        this.settings = settings;
        this.tenure = tenure;
        this.journal = journal;
    }

    /**
     * Checks a status; a refused one is counted and journaled ({@code statusRefused} with its reason
     * code), at most once per code and controller per watchdog period so a standby or a flood does
     * not fill the journal.
     *
     * @return whether the status may be taken
     */
    boolean admit(ControllerStatus s, String topicControllerId, long nowMs, long nowNanos) {
        StatusRefusal r = check(s, topicControllerId, nowMs, nowNanos);
        if (r == null) {
            return true;
        }
        refusals++;
        String key = r.code() + '/' + s.controllerId();
        if (!key.equals(lastJournaledKey) || nowNanos - lastJournaledNanos > settings.watchdogS() * 1e9) {
            lastJournaledKey = key;
            lastJournaledNanos = nowNanos;
            journal.decision(nowMs, settings.unitId(), "statusRefused", r.code(), r.detail());
        }
        return false;
    }

    /** @return statuses refused so far (safe from any thread) */
    long refusals() {
        return refusals;
    }

    void requireSignatures(StatusSeal statusSeal) {
        this.seal = statusSeal;
    }

    boolean requiresSignatures() {
        return seal != null;
    }

    /**
     * @param topicControllerId the controller id of the topic the status arrived on
     * @return null when the status may be taken, else why not
     */
    StatusRefusal check(ControllerStatus s, String topicControllerId, long nowMs, long nowNanos) {
        if (!s.controllerId().equals(topicControllerId)) {
            return new StatusRefusal("wrongTopic", "status of controller " + s.controllerId()
                    + " arrived on controller " + topicControllerId + "'s topic");
        }
        if (!settings.acceptedControllers().contains(s.controllerId())) {
            return new StatusRefusal("notAccepted", "controller " + s.controllerId() + " is not accepted (accepted: "
                    + settings.acceptedControllers() + ")");
        }
        if (seal != null && seal.hasKeyFor(s.controllerId())) {
            VerificationResult v = seal.verify(s, nowMs);
            if (!v.accepted()) {
                return new StatusRefusal(v.reason().wireName(), v.detail());
            }
        }
        tenure.announce(s.controllerId());
        Refusal r = tenure.check(s.controllerId(), s.epoch(), nowMs, nowNanos);
        if (r == null) {
            return null;
        }
        String code = r.reason() == RefusalReason.NOT_YET_VALID ? "epochAhead"
                : r.reason() == RefusalReason.WRONG_CONTROLLER ? "standby" : "olderEpoch";
        return new StatusRefusal(code, r.detail());
    }
}
