package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Reading the unit physics returns to the plant interface.
 *
 * @param seq             per-publisher sequence number, ≥ 0
 * @param sourceTime      epoch ms of the state the reading was taken from (the physics' time, older than
 *                        the clock's while the physics lags), &gt; 0
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
