package org.loopstand.controller.intake;

import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.codec.DecodeError;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The stateless half of the intake: parses the topic and decodes + checks the payload with the
 * codec. Touches no state, so the bus delivery threads run it in parallel before handing the result
 * to the {@link IntakeRouter}'s queue; the stateful source checks stay on the cycle thread.
 */
final class IntakeDecoder {
    /**
     * A message as handed over by a bus thread: stamped with controller time on arrival, topic
     * parsed and payload decoded there. Either {@code value} is the decoded record or
     * {@code rejectReason}/{@code rejectDetail} say why there is none. {@code payload} is kept as it
     * came, for the journal's input entries (exact replay).
     */
    record Arrival(InboundMessage message, String topic, byte[] payload, ParsedTopic parsed, Object value,
                   String rejectReason, String rejectDetail, long receivedAtMs) {
    }

    private final String siteId;
    private final MessageCodec codec;

    IntakeDecoder(String siteId, MessageCodec codec) {
        this.siteId = siteId;
        this.codec = codec;
    }

    /**
     * @param m            the message as the bus handed it over, or null when a test routes by hand
     * @param receivedAtMs controller time of arrival, epoch ms
     * @return the decoded record or the reason there is none; never throws
     */
    Arrival decode(InboundMessage m, String topic, byte[] payload, long receivedAtMs) {
        ParsedTopic p = TopicTree.parse(topic).orElse(null);
        if (p == null || !p.site().equals(siteId)) {
            return new Arrival(m, topic, payload, null, null, "unknownTopic", "not a topic of site " + siteId, receivedAtMs);
        }
        Class<?> type = switch (p.kind()) {
            case AREA_METER -> AreaMeter.class;
            case UNIT_TELEMETRY -> UnitTelemetry.class;
            case UNIT_ACK -> CommandAck.class;
            case AREA_SCHEDULE -> Schedule.class;
            case CLOCK -> ClockTick.class;
            default -> null;
        };
        if (type == null) {
            return new Arrival(m, topic, payload, p, null, "unknownTopic", "the controller does not read " + p.kind() + " topics",
                    receivedAtMs);
        }
        Decoded<?> d = codec.decode(payload, type);
        if (d instanceof Decoded.Ok<?> ok) {
            return new Arrival(m, topic, payload, p, ok.value(), null, null, receivedAtMs);
        }
        DecodeError e = d.rejection().orElseThrow();
        return new Arrival(m, topic, payload, p, null, e.kind().name(), e.toString(), receivedAtMs);
    }
}
