package org.loopstand.protocol.message;

import java.util.List;
import java.util.Objects;

/**
 * An area whose regulation the controller has suspended while it may still regulate others, as
 * listed in its status.
 *
 * @param area    area id
 * @param reasons reason codes (at least one, each 1 to 256 characters), e.g.
 *                {@code frequencyUnusable:north}, {@code tieFlowUnusable:south:north-south}
 * @param detail  the figures behind the reasons (1 to 256 characters), e.g.
 *                {@code frequency:north frozen ageMs=1200}
 * @param since   controller time the area was suspended, epoch ms, ≥ 1
 */
public record SuspendedArea(String area, List<String> reasons, String detail, long since) {
    public SuspendedArea {
        Objects.requireNonNull(area, "area");
        reasons = List.copyOf(reasons);
    }
}
