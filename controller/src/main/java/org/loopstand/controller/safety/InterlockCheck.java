package org.loopstand.controller.safety;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

/**
 * What the interlock needs to know for one cycle. Collect conditions with the adders; each adds
 * a stable reason code when the condition is bad.
 */
public final class InterlockCheck {
    private final List<String> reasons = new ArrayList<>();

    /** @param up false when the bus link (broker connection) is down: reason {@code busLinkDown} */
    public InterlockCheck busLink(boolean up) {
        if (!up) {
            reasons.add("busLinkDown");
        }
        return this;
    }

    /** Reason {@code frequencyUnusable:{area}} when the area's frequency is unusable (after hold). */
    public InterlockCheck frequency(String areaId, boolean usable) {
        if (!usable) {
            reasons.add("frequencyUnusable:" + areaId);
        }
        return this;
    }

    /** Reason {@code tieFlowUnusable:{area}:{tie}} for a needed tie flow that is unusable. */
    public InterlockCheck tieFlow(String areaId, String tieId, boolean usable) {
        if (!usable) {
            reasons.add("tieFlowUnusable:" + areaId + ":" + tieId);
        }
        return this;
    }

    /** Reason {@code scheduleMissing:{area}} when no schedule is known for the area. */
    public InterlockCheck schedule(String areaId, boolean known) {
        if (!known) {
            reasons.add("scheduleMissing:" + areaId);
        }
        return this;
    }

    /**
     * Reason {@code aceBeyondSanityLimit:{area}} when |ACE| exceeds the limit; NaN counts as beyond.
     */
    public InterlockCheck ace(String areaId, double aceMw, double sanityLimitMw) {
        if (!(Math.abs(aceMw) <= sanityLimitMw)) {
            reasons.add("aceBeyondSanityLimit:" + areaId);
        }
        return this;
    }

    /** Any other reason with a code of the caller's choosing (e.g. {@code operatorSuspend}). */
    public InterlockCheck other(String code) {
        reasons.add(code);
        return this;
    }

    public List<String> reasons() {
        return Collections.unmodifiableList(reasons);
    }
}
