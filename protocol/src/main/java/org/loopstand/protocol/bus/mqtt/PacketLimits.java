package org.loopstand.protocol.bus.mqtt;

import org.loopstand.protocol.codec.MessageCodec;

/**
 * The largest MQTT packet the rig takes on any link and at its brokers, so that an oversized
 * payload is refused by the transport and never read whole into memory before the codec's own
 * {@value MessageCodec#DEFAULT_MAX_PAYLOAD_BYTES}-byte check. Every {@link MqttLink} announces it in
 * its CONNECT (MQTT 5 Maximum Packet Size: the broker must not send a larger packet, it drops it
 * instead), the embedded broker is configured with it, and the shipped Mosquitto configurations
 * set {@code max_packet_size} to it.
 */
public final class PacketLimits {
    /** Largest packet, bytes: the codec's payload limit plus room for topic and properties. */
    public static final int MAX_PACKET_BYTES = 2 * MessageCodec.DEFAULT_MAX_PAYLOAD_BYTES;

    private PacketLimits() {
    }
}
