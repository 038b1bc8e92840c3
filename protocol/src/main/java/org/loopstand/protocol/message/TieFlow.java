package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Measured flow on one tie line.
 *
 * @param tie     tie id
 * @param flowMw  flow, MW; positive = export from the metering area; |flowMw| ≤ 1e6
 * @param quality quality of the measurement
 */
public record TieFlow(String tie, double flowMw, Quality quality) {
    public TieFlow {
        Objects.requireNonNull(tie, "tie");
    }
}
