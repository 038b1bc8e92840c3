package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Scheduled interchange and frequency of an area.
 *
 * @param seq                        per-publisher sequence number, ≥ 0
 * @param sourceTime                 epoch ms at the source, &gt; 0
 * @param area                       area id
 * @param scheduledNetInterchangeMw  scheduled net interchange, MW, positive = export
 * @param scheduledFrequencyHz       scheduled frequency, Hz, in [40, 70]
 * @param effectiveFrom              epoch ms from which the schedule applies, ≥ 0
 */
public record Schedule(long seq, long sourceTime, String area, double scheduledNetInterchangeMw,
        double scheduledFrequencyHz, long effectiveFrom) {
    public Schedule {
        Objects.requireNonNull(area, "area");
    }
}
