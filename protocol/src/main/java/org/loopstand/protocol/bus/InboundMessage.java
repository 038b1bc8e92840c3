package org.loopstand.protocol.bus;

/**
 * One message received from the bus, as handed to the application (never on the transport's thread).
 *
 * @param topic          topic it was published on
 * @param payload        raw bytes, not yet decoded
 * @param qos            QoS it was delivered with
 * @param retained       true when it is a retained value delivered on subscribe
 * @param duplicate      true when the transport marked it as a possible redelivery
 * @param receivedNanos  receiver's clock (monotonic ns) when the transport handed it over
 */
public record InboundMessage(String topic, byte[] payload, Qos qos, boolean retained, boolean duplicate,
                             long receivedNanos) {
}
