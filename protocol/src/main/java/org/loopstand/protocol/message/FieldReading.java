package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Reading the unit physics returns to the plant interface.
 *
 * @param seq             per-publisher sequence number, ≥ 0
 * @param sourceTime      epoch ms at the source, &gt; 0
 * @param unit            unit id
 * @param outputMw        electrical output, MW
 * @param loadReferenceMw load reference in effect, MW
 * @param status          online, offline or tripped
 */
public record FieldReading(long seq, long sourceTime, String unit, double outputMw, double loadReferenceMw,
        UnitStatus status) {
    public FieldReading {
        Objects.requireNonNull(unit, "unit");
    }
}
