package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.SiteArea;
import org.loopstand.controller.config.SiteUnit;
import org.loopstand.controller.intake.AreaCycleInputs;
import org.loopstand.controller.intake.IntakeRouter;
import org.loopstand.controller.intake.SeqTracker;
import org.loopstand.controller.intake.SourceValidator;
import org.loopstand.controller.intake.ValidatedInput;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * What a cycle used and what the intake has seen so far, as fields of the {@code decided} journal entry
 * (the report's age of data at use and loss figures come from them).
 *
 * <ul>
 *   <li>{@code used}: per area the age (controller time − source time, ms) of the frequency and of each
 *       tie flow the cycle got as usable (an unusable value was not used and has no age here); for the
 *       units whose telemetry was good, their count and the max and median (nearest rank) age, ms.</li>
 *   <li>{@code intake}: running counters per message kind ({@code areaMeter}, {@code unitTelemetry}):
 *       {@code received} (routed by the intake), {@code rejected} (refused by the intake, by topic),
 *       and from the intake's sequence trackers {@code seqGaps} (jumps), {@code seqMissing} (numbers
 *       skipped), {@code duplicates}, {@code outOfOrder}; plus {@code queueFull} (not per kind).</li>
 * </ul>
 * Meter sequence counters cover the sources the intake tracks: each area's primary meter and, under the
 * alternateSource policy, its alternate. A message is counted as received when the intake routes it
 * (agent thread), not on the bus thread when it lands in the queue: so the counters of a cycle depend on
 * the inputs routed before it alone, and a replay of the journal gives the same figures. A message
 * refused for a full queue is counted in {@code queueFull} only.
 */
final class InputUseJournal {
    static final String AREA_METER = "areaMeter";
    static final String UNIT_TELEMETRY = "unitTelemetry";

    private final ControllerSiteConfig site;
    private final IntakeRouter intake;
    /** messages routed: [area meters, unit telemetry] */
    private final long[] received = new long[2];
    /** messages refused by the intake: [area meters, unit telemetry] */
    private final long[] rejected = new long[2];

    InputUseJournal(ControllerSiteConfig site, IntakeRouter intake) {
        this.site = site;
        this.intake = intake;
    }

    /** Counts a message the intake routes, by the kind of its topic. */
    void onRouted(String topic) {
        countByKind(received, topic);
    }

    /** Counts a message the intake refused, by the kind of its topic. */
    void onRejected(String topic) {
        countByKind(rejected, topic);
    }

    private static void countByKind(long[] counters, String topic) {
        TopicKind k = TopicTree.parse(topic).map(ParsedTopic::kind).orElse(null);
        if (k == TopicKind.AREA_METER) {
            counters[0]++;
        } else if (k == TopicKind.UNIT_TELEMETRY) {
            counters[1]++;
        }
    }

    /** @return the {@code used} field: ages of what this cycle used */
    Map<String, Object> used(List<AreaCycleInputs> areas, List<UnitState> units, long nowMs) {
        Map<String, Object> perArea = new LinkedHashMap<>();
        for (AreaCycleInputs a : areas) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("frequencyAgeMs", ageOrNull(a.frequencyHz()));
            Map<String, Object> ties = new LinkedHashMap<>();
            a.tieFlowsMw().entrySet().stream().sorted(Map.Entry.comparingByKey())
                    .forEach(t -> ties.put(t.getKey(), ageOrNull(t.getValue())));
            f.put("tieFlowAgeMs", ties);
            perArea.put(a.areaId(), f);
        }
        List<Long> ages = new ArrayList<>();
        for (UnitState u : units) {
            if (u.telemetryGood()) {
                ages.add(nowMs - u.telemetryTimeMs());
            }
        }
        ages.sort(null);
        Map<String, Object> unitAges = new LinkedHashMap<>();
        unitAges.put("count", ages.size());
        unitAges.put("telemetryAgeMaxMs", ages.isEmpty() ? null : ages.get(ages.size() - 1));
        // nearest rank: rank ⌈n/2⌉, the lower middle for an even count
        unitAges.put("telemetryAgeMedianMs", ages.isEmpty() ? null : ages.get((ages.size() + 1) / 2 - 1));
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("areas", perArea);
        out.put("units", unitAges);
        return out;
    }

    /** @return the {@code intake} field: running counters per message kind */
    Map<String, Object> counters() {
        List<SeqTracker> meterSeqs = new ArrayList<>();
        for (SiteArea a : site.areas()) {
            ValidatedInput f = intake.frequencyInput(a.id());
            meterSeqs.add(f.primary().seqTracker());
            if (f.alternate() != null) {
                meterSeqs.add(f.alternate().seqTracker());
            }
        }
        List<SeqTracker> unitSeqs = new ArrayList<>();
        for (SiteUnit u : site.units()) {
            SourceValidator v = intake.telemetryCheck(u.id());
            if (v != null) {
                unitSeqs.add(v.seqTracker());
            }
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put(AREA_METER, kind(received[0], rejected[0], meterSeqs));
        out.put(UNIT_TELEMETRY, kind(received[1], rejected[1], unitSeqs));
        out.put("queueFull", intake.rejectedByReason().getOrDefault("queueFull", 0L));
        return out;
    }

    /**
     * {@code received} counts every message of the kind the intake routed (repeats, out-of-order
     * and forged ones included); {@code taken} only those of the tracked sources taken in sequence,
     * the same population as {@code seqMissing}, so loss = missing / (taken + missing) per kind.
     * Seq jumps are counted apart ({@code seqJumps}, of which {@code seqJumpsRevoked} were one bad
     * message), never as missing messages.
     */
    private static Map<String, Object> kind(long received, long rejected, List<SeqTracker> seqs) {
        long taken = 0;
        long jumps = 0;
        long revoked = 0;
        long restarts = 0;
        long gaps = 0;
        long missing = 0;
        long duplicates = 0;
        long outOfOrder = 0;
        for (SeqTracker s : seqs) {
            gaps += s.gapCount();
            missing += s.missingCount();
            duplicates += s.duplicateCount();
            outOfOrder += s.outOfOrderCount();
            taken += s.takenCount();
            jumps += s.jumpCount();
            revoked += s.revokedJumpCount();
            restarts += s.restartCount();
        }
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("received", received);
        m.put("taken", taken);
        m.put("rejected", rejected);
        m.put("seqGaps", gaps);
        m.put("seqMissing", missing);
        m.put("duplicates", duplicates);
        m.put("outOfOrder", outOfOrder);
        m.put("seqJumps", jumps);
        m.put("seqJumpsRevoked", revoked);
        m.put("seqRestarts", restarts);
        return m;
    }

    private static Long ageOrNull(ValidatedValue v) {
        return v != null && v.usable() && v.ageMs() != Long.MAX_VALUE ? v.ageMs() : null;
    }
}
