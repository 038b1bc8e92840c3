package org.loopstand.plant.fault;

import java.util.List;

/**
 * One message through the publication fault stage: the truth as built and what went on the wire.
 *
 * @param stream    stream key, {@code meter/{area}/{meter}} or {@code telemetry/{unit}}
 * @param topic     topic it was (or would have been) published on
 * @param truth     the record as the plant built it from the physics
 * @param published the record handed to the bus; null when nothing was sent
 * @param fate      {@code sent}, {@code dropped}, {@code linkDown}, {@code queueFull} or {@code unencodable}
 * @param faultIds  ids of the faults that acted on it (empty = untouched)
 * @param detail    why, for people (e.g. "held 3000 ms"); may be empty
 */
public record Publication(String stream, String topic, Object truth, Object published, String fate,
                          List<String> faultIds, String detail) {
    public static final String SENT = "sent";
    public static final String DROPPED = "dropped";
    public static final String LINK_DOWN = "linkDown";
    public static final String QUEUE_FULL = "queueFull";
    public static final String UNENCODABLE = "unencodable";

    public Publication {
        faultIds = List.copyOf(faultIds);
    }

    public boolean affected() {
        return !faultIds.isEmpty();
    }
}
