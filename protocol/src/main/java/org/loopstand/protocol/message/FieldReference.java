package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Load reference the plant interface sends to the unit physics.
 *
 * @param seq             per-publisher sequence number, ≥ 0
 * @param sourceTime      epoch ms at the source, &gt; 0
 * @param unit            unit id
 * @param loadReferenceMw load reference, MW
 * @param online          whether the unit is to be connected
 */
public record FieldReference(long seq, long sourceTime, String unit, double loadReferenceMw, boolean online) {
    public FieldReference {
        Objects.requireNonNull(unit, "unit");
    }
}
