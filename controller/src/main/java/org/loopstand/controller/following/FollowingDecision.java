package org.loopstand.controller.following;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * A decision of the following check about one unit, for the journal, the status and the report.
 *
 * @param unitId       unit id
 * @param areaId       area the unit regulates for
 * @param event        what happened: {@link #EXCLUDED}, {@link #PROBE_SENT}, {@link #PROBE_FAILED},
 *                     {@link #READMITTED}
 * @param reason       stable reason code: {@code notFollowing}, {@code readmissionProbe},
 *                     {@code probeNotFollowed}, {@code probeFollowed} or {@code caughtUp}
 * @param expectedMw   expected (governor-corrected) output at the check, MW; NaN for a probe sent
 * @param measuredMw   measured (governor-corrected) output at the check, MW
 * @param shortfallMw  shortfall in the direction of the move, MW; NaN for a probe sent
 * @param allowanceMw  governor allowance on top of the tolerance, MW; NaN for a probe sent
 * @param missedChecks consecutive failed checks at the decision
 * @param probeMw      size of the probe move, MW (0 unless a probe was sent)
 */
public record FollowingDecision(String unitId, String areaId, String event, String reason, double expectedMw,
                                double measuredMw, double shortfallMw, double allowanceMw, int missedChecks,
                                double probeMw) {
    public static final String EXCLUDED = "unitExcluded";
    public static final String PROBE_SENT = "probeSent";
    public static final String PROBE_FAILED = "probeFailed";
    public static final String READMITTED = "unitReadmitted";

    /** @return the decision a check implies, or null when the check changed nothing */
    public static FollowingDecision of(FollowingCheck c, String areaId) {
        String event;
        String reason;
        if (c.flaggedNow()) {
            event = EXCLUDED;
            reason = "notFollowing";
        } else if (c.probeFailedNow()) {
            event = PROBE_FAILED;
            reason = "probeNotFollowed";
        } else if (c.returnedNow()) {
            event = READMITTED;
            reason = c.probing() ? "probeFollowed" : "caughtUp";
        } else {
            return null;
        }
        return new FollowingDecision(c.unitId(), areaId, event, reason, c.expectedMw(), c.measuredMw(),
                c.shortfallMw(), c.allowanceMw(), c.missedCycles(), 0);
    }

    /** @return a probe sent to a flagged unit */
    public static FollowingDecision probeSent(String unitId, String areaId, double measuredMw, double probeMw) {
        return new FollowingDecision(unitId, areaId, PROBE_SENT, "readmissionProbe", Double.NaN, measuredMw,
                Double.NaN, Double.NaN, 0, probeMw);
    }

    /** @return the figures as journal fields (no NaN: absent figures are left out) */
    public Map<String, Object> journalFields() {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", event);
        f.put("unit", unitId);
        f.put("area", areaId);
        f.put("reason", reason);
        putFinite(f, "expectedMw", expectedMw);
        putFinite(f, "measuredMw", measuredMw);
        putFinite(f, "shortfallMw", shortfallMw);
        putFinite(f, "allowanceMw", allowanceMw);
        f.put("missedChecks", missedChecks);
        if (probeMw != 0) {
            f.put("probeMw", probeMw);
        }
        return f;
    }

    private static void putFinite(Map<String, Object> f, String key, double v) {
        if (Double.isFinite(v)) {
            f.put(key, Math.round(v * 1000) / 1000.0);
        }
    }
}
