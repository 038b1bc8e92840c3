package org.loopstand.protocol.message;

import java.util.List;
import java.util.Objects;

/**
 * The controller's state, published each cycle and retained; the offline form is its last will.
 *
 * @param seq          per-controller sequence number, ≥ 0
 * @param sourceTime   epoch ms at the controller, &gt; 0
 * @param controllerId controller id
 * @param epoch        controller epoch, epoch ms (its start time; a takeover raises it), ≥ 0
 * @param state        regulating, suspended, off or offline
 * @param reasons      why it is not regulating (free text, each 1 to 256 characters), may be empty
 * @param cycle        control cycle count, ≥ 0
 * @param areas        ACE of each area (area ids unique)
 * @param excludedUnits units taken out of the allocation and why (unit ids unique); optional, absent
 *                     when none is excluded
 * @param suspendedAreas areas whose regulation is suspended while the controller regulates others
 *                     (or all areas while it is suspended), with reasons and figures (area ids
 *                     unique); optional, absent when every area regulates
 * @param keyId        id of the controller's status key, optional (set when keys are configured)
 * @param signature    base64 HMAC over the canonical bytes, optional
 */
public record ControllerStatus(long seq, long sourceTime, String controllerId, long epoch, ControllerState state,
        List<String> reasons, long cycle, List<AreaAce> areas, @OptionalField List<ExcludedUnit> excludedUnits,
        @OptionalField List<SuspendedArea> suspendedAreas, @OptionalField String keyId, @OptionalField String signature) {
    public ControllerStatus {
        Objects.requireNonNull(controllerId, "controllerId");
        reasons = List.copyOf(reasons);
        areas = List.copyOf(areas);
        excludedUnits = excludedUnits == null || excludedUnits.isEmpty() ? null : List.copyOf(excludedUnits);
        suspendedAreas = suspendedAreas == null || suspendedAreas.isEmpty() ? null : List.copyOf(suspendedAreas);
    }

    /** An unsigned status that excludes no unit. */
    public ControllerStatus(long seq, long sourceTime, String controllerId, long epoch, ControllerState state,
                            List<String> reasons, long cycle, List<AreaAce> areas) {
        this(seq, sourceTime, controllerId, epoch, state, reasons, cycle, areas, null, null, null, null);
    }

    /** An unsigned status. */
    public ControllerStatus(long seq, long sourceTime, String controllerId, long epoch, ControllerState state,
                            List<String> reasons, long cycle, List<AreaAce> areas, List<ExcludedUnit> excludedUnits) {
        this(seq, sourceTime, controllerId, epoch, state, reasons, cycle, areas, excludedUnits, null, null, null);
    }

    /** An unsigned status with suspended areas. */
    public ControllerStatus(long seq, long sourceTime, String controllerId, long epoch, ControllerState state,
                            List<String> reasons, long cycle, List<AreaAce> areas, List<ExcludedUnit> excludedUnits,
                            List<SuspendedArea> suspendedAreas) {
        this(seq, sourceTime, controllerId, epoch, state, reasons, cycle, areas, excludedUnits, suspendedAreas, null,
                null);
    }

    /** @return this status with key id and signature set (both may be null to clear them) */
    public ControllerStatus withSignature(String newKeyId, String newSignature) {
        return new ControllerStatus(seq, sourceTime, controllerId, epoch, state, reasons, cycle, areas, excludedUnits, suspendedAreas,
                newKeyId, newSignature);
    }
}
