package org.loopstand.controller.intake;

import org.loopstand.controller.config.InputValidationSettings;

import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Set;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.SiteTie;

/**
 * The flow of every tie seen from each of its end areas (+ = export from that area), each a
 * {@link ValidatedInput}: primary = that area's primary meter, alternate = the other end's primary
 * meter with the sign flipped. Cross check of each tie metered at both ends: when both ends' values
 * are usable and this end's flow and the other end's (sign flipped) differ by more than
 * {@value #TIE_ENDS_TOLERANCE_MW} MW for {@value #TIE_ENDS_DISAGREE_CYCLES} evaluations in a row, the
 * tie flow is unusable at both ends ({@code endsDisagree}): one meter is wrong (reversed, scaled,
 * stuck) and we cannot tell which. The run of evaluations keeps a transient swing seen by two meters
 * scanned at different instants from suspending control. Not thread-safe: the cycle thread.
 */
final class TieFlowInputs {
    /** Largest difference between the two ends of a tie taken as agreement, MW (lossless ties, meter noise ≲ 1 MW). */
    static final double TIE_ENDS_TOLERANCE_MW = 50;
    /** Evaluations (cycles) in a row of disagreement before the tie flow is unusable. */
    static final int TIE_ENDS_DISAGREE_CYCLES = 3;

    private final Map<String, SiteTie> ties = new HashMap<>();
    /** key area + "/" + tie */
    private final Map<String, ValidatedInput> byEnd = new LinkedHashMap<>();
    /** per tie: cycles in a row its two ends disagreed, and the cycle time last counted */
    private final Map<String, long[]> disagreement = new HashMap<>();

    TieFlowInputs(ControllerSiteConfig site, InputValidationSettingsFactory settings) {
        for (SiteTie t : site.ties()) {
            ties.put(t.id(), t);
        }
        site.areas().forEach(a -> site.tiesOf(a.id()).forEach(t ->
                byEnd.put(a.id() + "/" + t.id(), new ValidatedInput(settings.of(a.id(), t.id())))));
    }

    /** Builds the validation settings of one tie flow seen from one end. */
    @FunctionalInterface
    interface InputValidationSettingsFactory {
        InputValidationSettings of(String areaId, String tieId);
    }

    /**
     * A tie flow reported by {@code area}'s primary meter: its own end's primary source and the other
     * end's alternate (sign flipped). @return false when the area has no such tie
     */
    boolean accept(String area, String tieId, MeasuredValue own) {
        ValidatedInput mine = byEnd.get(area + "/" + tieId);
        if (mine == null) {
            return false;
        }
        mine.acceptPrimary(own);
        ValidatedInput theirs = byEnd.get(ties.get(tieId).otherEnd(area) + "/" + tieId);
        if (theirs != null && theirs.alternate() != null) {
            theirs.acceptAlternate(new MeasuredValue(-own.value(), own.sourceTimeMs(), own.receivedAtMs(),
                    own.qualityGood(), own.seq()));
        }
        return true;
    }

    /** @return the flow of {@code tie} seen from {@code areaId} at {@code nowMs}, ends cross check applied */
    ValidatedValue evaluate(String areaId, SiteTie tie, long nowMs) {
        ValidatedValue mine = byEnd.get(areaId + "/" + tie.id()).evaluate(nowMs);
        return endsDisagree(tie, nowMs) ? withEndsDisagree(mine) : mine;
    }

    /** Counts at most once per {@code nowMs} (both areas of a tie ask in the same cycle). */
    private boolean endsDisagree(SiteTie t, long nowMs) {
        long[] state = disagreement.computeIfAbsent(t.id(), k -> new long[] {0, Long.MIN_VALUE});
        if (state[1] != nowMs) {
            state[1] = nowMs;
            ValidatedValue from = byEnd.get(t.fromArea() + "/" + t.id()).evaluate(nowMs);
            ValidatedValue to = byEnd.get(t.toArea() + "/" + t.id()).evaluate(nowMs);
            boolean disagree = from.usable() && to.usable() && Math.abs(from.value() + to.value()) > TIE_ENDS_TOLERANCE_MW;
            state[0] = disagree ? state[0] + 1 : 0;
        }
        return state[0] >= TIE_ENDS_DISAGREE_CYCLES;
    }

    private static ValidatedValue withEndsDisagree(ValidatedValue v) {
        Set<ValidationReason> reasons = new HashSet<>(v.reasons());
        reasons.add(ValidationReason.ENDS_DISAGREE);
        return ValidatedValue.unusable(reasons, v.ageMs());
    }

    /** Scales every tie input's clock skew limit to the replay rate. */
    void scaleClockSkewLimit(double rate) {
        byEnd.values().forEach(v -> v.scaleClockSkewLimit(rate));
    }

    /** @return the flow input of a tie seen from one area, or null */
    ValidatedInput input(String areaId, String tieId) {
        return byEnd.get(areaId + "/" + tieId);
    }
}
