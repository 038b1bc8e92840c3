package org.loopstand.plant.fault;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** What the stale and loss faults remember about one published stream (a meter or a unit's telemetry). */
public final class StreamMemory {
    Object lastTruth;
    Object lastSent;
    int burstLeft;
    private final Map<String, Object> frozen = new HashMap<>();
    private final Map<String, Long> frozenTime = new HashMap<>();
    private final Map<String, Integer> counts = new HashMap<>();

    /** @return the record fault {@code faultId} froze: the last truth before it started (or {@code truth} on the first message) */
    Object frozenRecord(String faultId, Object truth) {
        return frozen.computeIfAbsent(faultId, k -> lastTruth != null ? lastTruth : truth);
    }

    /** @return the sourceTime fault {@code faultId} froze, epoch ms */
    long frozenSourceTime(String faultId, Object truth) {
        return frozenTime.computeIfAbsent(faultId, k -> Records.sourceTime(lastTruth != null ? lastTruth : truth));
    }

    /** @return messages of this stream fault {@code faultId} acted on before */
    int count(String faultId) {
        return counts.getOrDefault(faultId, 0);
    }

    void counted(List<FaultSpec> faults) {
        faults.forEach(f -> counts.merge(f.id(), 1, Integer::sum));
    }

    void forgetEnded(List<FaultSpec> active) {
        List<String> ids = active.stream().map(FaultSpec::id).toList();
        frozen.keySet().retainAll(ids);
        frozenTime.keySet().retainAll(ids);
        counts.keySet().retainAll(ids);
        if (active.stream().noneMatch(f -> f.behaviour() instanceof StreamFault s && s.keepsBurst())) {
            burstLeft = 0;
        }
    }
}
