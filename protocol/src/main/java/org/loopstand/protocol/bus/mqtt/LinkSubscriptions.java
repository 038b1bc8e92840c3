package org.loopstand.protocol.bus.mqtt;

import java.util.List;
import java.util.Objects;
import java.util.concurrent.locks.ReentrantLock;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.Qos;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The subscriptions of an {@link MqttLink}: kept in its {@link SubscriptionTable} whatever the
 * connection state, made at the broker when connected, and all made again after every (re)connect,
 * on whichever node the link reached (Paho does not resubscribe, and another node of a cluster knows
 * nothing of the old session).
 */
final class LinkSubscriptions {
    private static final Logger LOG = LoggerFactory.getLogger(LinkSubscriptions.class);

    private final MqttAsyncClient client;
    private final MqttLinkConfig config;
    private final SubscriptionTable table;
    private final ReentrantLock lock = new ReentrantLock();

    LinkSubscriptions(MqttAsyncClient client, MqttLinkConfig config, SubscriptionTable table) {
        this.client = client;
        this.config = config;
        this.table = table;
    }

    /** Adds to the table; when connected, waits for the SUBACK (at most the operation timeout). */
    void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        Objects.requireNonNull(qos, "qos");
        Objects.requireNonNull(listener, "listener");
        try {
            MqttTopicValidator.validate(topicFilter, true, true);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("bad topic filter '" + topicFilter + "': " + e.getMessage(), e);
        }
        lock.lock();
        try {
            if (!table.add(topicFilter, qos, listener) || !client.isConnected()) {
                return;
            }
            SubscriptionTable.Entry entry = table.get(topicFilter);
            IMqttToken token = client.subscribe(new MqttSubscription(topicFilter, entry.qos().level()));
            token.waitForCompletion(config.operationTimeoutMs());
            checkGranted(token, List.of(topicFilter));
        } catch (MqttException e) {
            // Kept in the table: it is made again after the next reconnect.
            LOG.warn("{}: subscribe to {} not confirmed yet ({}); retried after reconnect", config.clientId(),
                    topicFilter, e.getMessage());
        } finally {
            lock.unlock();
        }
    }

    void unsubscribe(String topicFilter) {
        lock.lock();
        try {
            if (table.remove(topicFilter) && client.isConnected()) {
                client.unsubscribe(topicFilter).waitForCompletion(config.operationTimeoutMs());
            }
        } catch (MqttException e) {
            LOG.warn("{}: unsubscribe from {} failed: {}", config.clientId(), topicFilter, e.getMessage());
        } finally {
            lock.unlock();
        }
    }

    /** Makes every subscription of the table at the broker just connected to; waits for the SUBACK. */
    void resubscribeAll() throws MqttException {
        lock.lock();
        try {
            List<SubscriptionTable.Entry> entries = table.entries();
            if (entries.isEmpty()) {
                return;
            }
            MqttSubscription[] subs = entries.stream()
                    .map(e -> new MqttSubscription(e.filter(), e.qos().level())).toArray(MqttSubscription[]::new);
            IMqttToken token = client.subscribe(subs);
            token.waitForCompletion(config.operationTimeoutMs());
            checkGranted(token, entries.stream().map(SubscriptionTable.Entry::filter).toList());
        } finally {
            lock.unlock();
        }
    }

    private void checkGranted(IMqttToken token, List<String> filters) {
        int[] codes = token.getReasonCodes();
        for (int i = 0; codes != null && i < codes.length && i < filters.size(); i++) {
            if (codes[i] >= 0x80) {
                LOG.error("{}: broker refused subscription {} (reason code 0x{})", config.clientId(), filters.get(i),
                        Integer.toHexString(codes[i]));
            }
        }
    }
}
