package org.loopstand.protocol.message;

import java.util.List;
import java.util.Objects;

/**
 * One scan of an area's meters: frequency, tie flows and net interchange.
 *
 * @param seq                   per-publisher sequence number, ≥ 0, increasing
 * @param sourceTime            epoch ms of the state the reading was taken from (the physics' time, older than
 *                              the clock's while the physics lags), &gt; 0
 * @param area                  area id
 * @param meter                 meter id
 * @param frequencyHz           measured frequency, Hz, in [40, 70]
 * @param frequencyQuality      quality of the frequency
 * @param ties                  flow on each tie of the area (tie ids unique)
 * @param netInterchangeMw      net actual interchange, MW, positive = export
 * @param netInterchangeQuality quality of the net interchange
 */
public record AreaMeter(long seq, long sourceTime, String area, String meter, double frequencyHz,
        Quality frequencyQuality, List<TieFlow> ties, double netInterchangeMw, Quality netInterchangeQuality) {
    public AreaMeter {
        Objects.requireNonNull(area, "area");
        Objects.requireNonNull(meter, "meter");
        ties = List.copyOf(ties);
    }
}
