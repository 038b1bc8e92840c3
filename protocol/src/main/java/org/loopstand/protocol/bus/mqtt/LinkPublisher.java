package org.loopstand.protocol.bus.mqtt;

import java.util.Map;
import java.util.Objects;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.LongAdder;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttActionListener;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttClientException;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.BusException.Reason;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;

/**
 * The publish path of an {@link MqttLink}: refuses at once when not connected or when the QoS 1
 * in-flight gate is full, maps Paho failures onto {@link Reason}s and counts every outcome.
 */
final class LinkPublisher {
    private final MqttAsyncClient client;
    private final InflightGate inflight;
    private final BusCounters counters;
    private final Map<Reason, LongAdder> failures;
    private final MqttLinkConfig config;

    LinkPublisher(MqttAsyncClient client, InflightGate inflight, BusCounters counters, Map<Reason, LongAdder> failures,
                  MqttLinkConfig config) {
        this.client = client;
        this.inflight = inflight;
        this.counters = counters;
        this.failures = failures;
        this.config = config;
    }

    CompletableFuture<Void> publish(OutboundMessage message, boolean closed) {
        Objects.requireNonNull(message, "message");
        if (closed) {
            return failed(Reason.CLOSED, "link is closed", null);
        }
        if (!client.isConnected()) {
            return failed(Reason.NOT_CONNECTED, "not connected to " + config.serverUri(), null);
        }
        boolean gated = message.qos() == Qos.AT_LEAST_ONCE;
        if (gated && !inflight.tryAcquire()) {
            return failed(Reason.BACK_PRESSURE, inflight.limit() + " QoS 1 publishes already in flight", null);
        }
        MqttMessage m = new MqttMessage(message.payload(), message.qos().level(), message.retained(), null);
        if (message.expirySeconds() > 0) {
            MqttProperties props = new MqttProperties();
            props.setMessageExpiryInterval(message.expirySeconds());
            m.setProperties(props);
        }
        CompletableFuture<Void> result = new CompletableFuture<>();
        AtomicBoolean released = new AtomicBoolean();
        Runnable release = () -> {
            if (gated && released.compareAndSet(false, true)) {
                inflight.release();
            }
        };
        try {
            client.publish(message.topic(), m, null, new MqttActionListener() {
                @Override
                public void onSuccess(IMqttToken token) {
                    release.run();
                    counters.onSent();
                    result.complete(null);
                }

                @Override
                public void onFailure(IMqttToken token, Throwable e) {
                    release.run();
                    fail(result, reasonOf(e), "publish to " + message.topic() + " failed: " + e.getMessage(), e);
                }
            });
        } catch (MqttException | RuntimeException e) {
            release.run();
            fail(result, reasonOf(e), "publish to " + message.topic() + " refused: " + e.getMessage(), e);
        }
        return result;
    }

    /** Maps Paho's reason codes onto the bus's reasons. */
    static Reason reasonOf(Throwable e) {
        if (e instanceof MqttException me) {
            switch (me.getReasonCode()) {
                case MqttClientException.REASON_CODE_MAX_INFLIGHT: // 32202 too many publishes in progress
                case MqttClientException.REASON_CODE_NO_MESSAGE_IDS_AVAILABLE: // 32001
                    return Reason.BACK_PRESSURE;
                case MqttClientException.REASON_CODE_CLIENT_NOT_CONNECTED: // 32104
                case MqttClientException.REASON_CODE_CONNECTION_LOST: // 32109
                case MqttClientException.REASON_CODE_CLIENT_DISCONNECTING: // 32102
                case MqttClientException.REASON_CODE_SERVER_DISCONNECTED: // 32204
                    return Reason.NOT_CONNECTED;
                case MqttClientException.REASON_CODE_CLIENT_CLOSED:
                    return Reason.CLOSED;
                case MqttClientException.REASON_CODE_CLIENT_TIMEOUT:
                    return Reason.TIMEOUT;
                default:
                    return me.getReasonCode() >= 0x80 && me.getReasonCode() <= 0xFF
                            ? Reason.REFUSED_BY_BROKER : Reason.TRANSPORT_ERROR;
            }
        }
        return Reason.TRANSPORT_ERROR;
    }

    private CompletableFuture<Void> failed(Reason reason, String text, Throwable cause) {
        CompletableFuture<Void> f = new CompletableFuture<>();
        fail(f, reason, text, cause);
        return f;
    }

    /** Counts a failure once per publish: Paho may report the same lost publish twice (connection lost, then session cleared). */
    private void fail(CompletableFuture<Void> f, Reason reason, String text, Throwable cause) {
        if (f.completeExceptionally(new BusException(reason, config.clientId() + ": " + text, cause))) {
            counters.onSendFailed();
            failures.get(reason).increment();
        }
    }

}
