package org.loopstand.controller.intake;

import java.util.HashMap;
import java.util.Map;

import org.loopstand.protocol.message.Schedule;

/**
 * The received schedules of each area. A schedule received later replaces every one received
 * before it that has not come into force yet; the one in force stays until the newer one's
 * effectiveFrom. So at most two are kept per area, and an old retained schedule with a later
 * effectiveFrom can never win over a newer one. Receipt order decides, not the source time, so a
 * schedule stamped in the future cannot hold back the real ones. Not thread-safe (cycle thread).
 */
final class AreaSchedules {
    private static final class Slot {
        Schedule inForce;
        Schedule pending;
    }

    private final Map<String, Slot> byArea = new HashMap<>();

    /** Takes a schedule as received. */
    void receive(String area, Schedule s) {
        Slot slot = byArea.computeIfAbsent(area, k -> new Slot());
        slot.pending = s;
    }

    /** @return the schedule in force at {@code nowMs}, or null when none has come into force */
    Schedule inForce(String area, long nowMs) {
        Slot slot = byArea.get(area);
        if (slot == null) {
            return null;
        }
        if (slot.pending != null && slot.pending.effectiveFrom() <= nowMs) {
            slot.inForce = slot.pending;
            slot.pending = null;
        }
        return slot.inForce;
    }
}
