package org.loopstand.controller.intake;

import org.loopstand.protocol.message.CommandAck;

/** What the intake tells its owner while it drains (on the draining thread). All methods optional. */
public interface IntakeObserver {
    /**
     * A message is about to be routed: called first for every message taken from the queue (refused
     * ones included), before anything else this observer hears about it.
     *
     * @param topic        topic it came on
     * @param payload      the payload as it came (not to be modified)
     * @param receivedAtMs controller time of its arrival, epoch ms
     */
    default void onInput(String topic, byte[] payload, long receivedAtMs) {
    }

    /**
     * A message could not be used at all.
     *
     * @param topic  topic it came on
     * @param reason stable code: a decode error kind (e.g. {@code MALFORMED}), {@code unknownTopic},
     *               {@code unknownArea}, {@code unknownUnit}, {@code topicMismatch}, {@code queueFull}
     * @param detail human-readable detail
     */
    default void onRejected(String topic, String reason, String detail) {
    }

    /** A command acknowledgement arrived (accepted or refused). */
    default void onAck(CommandAck ack, long receivedAtMs) {
    }

    /** A source's clock was first seen skewed beyond the limit (reported once per source and direction). */
    default void onClockSkew(String source, long skewMs) {
    }
}
