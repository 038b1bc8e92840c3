package org.loopstand.protocol.message;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Order to start or stop an injected fault.
 *
 * @param seq        per-publisher sequence number, ≥ 0
 * @param sourceTime epoch ms at the source, &gt; 0
 * @param orderId    order id (a stop names the order it ends)
 * @param action     start or stop
 * @param faultType  fault type name (id pattern), e.g. "meterFreeze"
 * @param targets    ids the fault acts on (units, ties, meters, areas)
 * @param parameters fault-specific settings: strings, finite numbers, booleans, lists, objects; no
 *                   nulls; held as unmodifiable copies, encoded with keys sorted
 * @param durationS  how long the fault lasts, s, in (0, 31536000]; absent = until stopped
 */
public record FaultOrder(long seq, long sourceTime, String orderId, FaultAction action, String faultType,
        List<String> targets, Map<String, Object> parameters, @OptionalField Double durationS) {
    public FaultOrder {
        Objects.requireNonNull(orderId, "orderId");
        targets = List.copyOf(targets);
        parameters = copyMap(parameters);
    }

    @SuppressWarnings("unchecked")
    private static Object deepCopy(Object value) {
        if (value instanceof Map<?, ?> map) {
            return copyMap((Map<String, Object>) map);
        }
        if (value instanceof List<?> list) {
            List<Object> copy = new ArrayList<>(list.size());
            for (Object element : list) {
                copy.add(deepCopy(element));
            }
            return Collections.unmodifiableList(copy);
        }
        return value;
    }

    private static Map<String, Object> copyMap(Map<String, Object> map) {
        // LinkedHashMap, not Map.copyOf: keeps insertion order for readers and lets the codec name a
        // null value instead of failing with a bare NullPointerException.
        Map<String, Object> copy = new LinkedHashMap<>();
        map.forEach((key, value) -> copy.put(Objects.requireNonNull(key, "parameter name"), deepCopy(value)));
        return Collections.unmodifiableMap(copy);
    }
}
