package org.loopstand.controller.cycle;

import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.loopstand.controller.safety.InterlockCheck;
import org.loopstand.controller.safety.InterlockDecision;
import org.loopstand.controller.config.InterlockSettings;
import org.loopstand.controller.safety.InterlockState;
import org.loopstand.controller.safety.RegulationInterlock;

/**
 * One interlock per area, so that only the areas whose data are unusable are suspended. The rule:
 * <ul>
 *   <li>the bus link down or a superseded epoch ({@code busLinkDown}, {@code staleEpoch:{unit}}):
 *       every area (nothing this controller sends can be trusted to land, or another instance
 *       has taken over);</li>
 *   <li>an area's own frequency, schedule or ACE unusable ({@code frequencyUnusable:{area}},
 *       {@code scheduleMissing:{area}}, {@code aceBeyondSanityLimit:{area}},
 *       {@code areaInputsMissing:{area}}): that area only. Another area's ACE is computed from its
 *       own frequency and its own end of its ties, none of which involves this area's data;</li>
 *   <li>a tie flow unusable at either end ({@code tieFlowUnusable:{end area}:{tie}}): both areas
 *       the tie connects. The two ends meter the same flow; with one end lost the cross check of
 *       the ends is lost too, so the remaining end's reading is unchecked and a reversed or stuck
 *       meter there would go unseen.</li>
 * </ul>
 * Each area resumes on its own after {@code resumeAfterClearCycles} clear cycles in a row, and
 * the caller makes its regulator track the units' present level on that cycle (bumpless). Pure
 * state machine, one {@link #evaluate} per cycle; not thread-safe.
 */
public final class AreaInterlocks {
    private final Map<String, RegulationInterlock> byArea = new LinkedHashMap<>();
    private final Map<String, Long> suspendedSinceMs = new LinkedHashMap<>();
    private final Map<String, String> details = new LinkedHashMap<>();

    /** @param areaIds every area of the site, in site order */
    public AreaInterlocks(Collection<String> areaIds, InterlockSettings settings) {
        for (String a : areaIds) {
            byArea.put(a, new RegulationInterlock(settings));
        }
    }

    /** The conditions of one cycle, collected per area before they are judged. */
    public static final class Conditions {
        private final List<String> global = new ArrayList<>();
        private final Map<String, Set<String>> byArea = new LinkedHashMap<>();
        private final Map<String, List<String>> detailByArea = new LinkedHashMap<>();
        private final Map<String, Set<String>> tieEnds = new LinkedHashMap<>();
        private final Map<String, List<String>> tieReasons = new LinkedHashMap<>();
        private final Map<String, List<String>> tieDetails = new LinkedHashMap<>();

        /** A reason that suspends every area (bus link, superseded epoch). */
        public Conditions global(String code) {
            global.add(code);
            return this;
        }

        /** A reason that suspends one area, with the figures behind it (may be empty). */
        public Conditions area(String areaId, String code, String detail) {
            byArea.computeIfAbsent(areaId, k -> new LinkedHashSet<>()).add(code);
            if (detail != null && !detail.isEmpty()) {
                detailByArea.computeIfAbsent(areaId, k -> new ArrayList<>()).add(detail);
            }
            return this;
        }

        /** The area has this tie: a reason on the tie at any end suspends it too. */
        public Conditions tieEnd(String areaId, String tieId) {
            tieEnds.computeIfAbsent(tieId, k -> new LinkedHashSet<>()).add(areaId);
            return this;
        }

        /** The tie flow seen from {@code areaId} is unusable: both ends of the tie are suspended. */
        public Conditions tieUnusable(String areaId, String tieId, String detail) {
            tieEnd(areaId, tieId);
            tieReasons.computeIfAbsent(tieId, k -> new ArrayList<>()).add("tieFlowUnusable:" + areaId + ":" + tieId);
            tieDetails.computeIfAbsent(tieId, k -> new ArrayList<>()).add(detail);
            return this;
        }

        List<String> reasonsOf(String areaId) {
            Set<String> r = new LinkedHashSet<>(global);
            r.addAll(byArea.getOrDefault(areaId, Set.of()));
            tieEnds.forEach((tie, ends) -> {
                if (ends.contains(areaId)) {
                    r.addAll(tieReasons.getOrDefault(tie, List.of()));
                }
            });
            return List.copyOf(r);
        }

        String detailOf(String areaId) {
            List<String> d = new ArrayList<>(detailByArea.getOrDefault(areaId, List.of()));
            tieEnds.forEach((tie, ends) -> {
                if (ends.contains(areaId)) {
                    d.addAll(tieDetails.getOrDefault(tie, List.of()));
                }
            });
            return String.join("; ", d);
        }

        /** @return every reason of every area and the global ones, without repeats, in order */
        List<String> allReasons(Collection<String> areaIds) {
            Set<String> r = new LinkedHashSet<>(global);
            for (String a : areaIds) {
                r.addAll(reasonsOf(a));
            }
            return List.copyOf(r);
        }
    }

    /** @return each area's state after this cycle, in site order */
    public Map<String, AreaInterlockState> evaluate(Conditions c, long nowMs) {
        Map<String, AreaInterlockState> out = new LinkedHashMap<>();
        for (Map.Entry<String, RegulationInterlock> e : byArea.entrySet()) {
            String area = e.getKey();
            InterlockCheck check = new InterlockCheck();
            List<String> reasons = c.reasonsOf(area);
            reasons.forEach(check::other);
            InterlockDecision d = e.getValue().evaluate(check);
            if (d.suspendedNow()) {
                suspendedSinceMs.put(area, nowMs);
            } else if (d.state() == InterlockState.SUSPENDED) {
                suspendedSinceMs.putIfAbsent(area, nowMs);
            }
            if (!reasons.isEmpty()) {
                String detail = c.detailOf(area);
                details.put(area, detail.isEmpty() ? String.join(",", reasons) : detail);
            }
            if (d.state() == InterlockState.REGULATING) {
                suspendedSinceMs.remove(area);
                details.remove(area);
            }
            List<String> shown = d.state() == InterlockState.REGULATING ? List.of()
                    : reasons.isEmpty() ? e.getValue().lastSuspendReasons() : reasons;
            out.put(area, new AreaInterlockState(area, d, shown, details.getOrDefault(area, String.join(",", shown)),
                    suspendedSinceMs.getOrDefault(area, 0L)));
        }
        return out;
    }
}
