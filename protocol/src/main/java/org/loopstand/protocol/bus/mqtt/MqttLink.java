package org.loopstand.protocol.bus.mqtt;

import java.io.IOException;
import java.net.Socket;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Random;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ScheduledThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.LongAdder;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.BusException.Reason;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.time.Clock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A {@link MessageBus} over one MQTT 5 connection (Eclipse Paho v5). Its own reconnect thread
 * reconnects with capped exponential backoff, resubscribes everything and then tells the
 * {@link ConnectionListener}s; Paho's automatic reconnect is off because it does not resubscribe and
 * work inside Paho callbacks can deadlock. Received messages go through a bounded queue to one
 * delivery thread. QoS 1 publishes are gated by the broker's Receive Maximum and refused with
 * {@link Reason#BACK_PRESSURE} past it. Threads: Paho's own, plus one delivery and one reconnect thread.
 *
 * <p>Use: construct, {@link #subscribe} what is needed (may be before connecting, so messages queued
 * in a resumed session find their listener), then {@link #start()} and optionally
 * {@link #awaitConnected(long)}.
 */
public final class MqttLink implements MessageBus {
    private static final Logger LOG = LoggerFactory.getLogger(MqttLink.class);
    private static final int DEFAULT_RECEIVE_MAXIMUM = 65_535;

    private final MqttLinkConfig config;
    private final Clock clock;
    private final BusCounters counters = new BusCounters();
    private final Map<Reason, LongAdder> failures = new EnumMap<>(Reason.class);
    private final NoDelaySockets sockets = new NoDelaySockets();
    private final MqttAsyncClient client;
    private final MqttConnectionOptions options;
    private final SubscriptionTable subscriptions = new SubscriptionTable();
    private final ReceiveQueue receiveQueue;
    private final InflightGate inflight = new InflightGate();
    private final ReconnectBackoff backoff;
    private final LinkPublisher publisher;
    private final ScheduledThreadPoolExecutor reconnectThread;
    private final List<ConnectionListener> connectionListeners = new CopyOnWriteArrayList<>();
    private final ReentrantLock stateLock = new ReentrantLock();
    private final Condition connectedChanged = stateLock.newCondition();
    private final ReentrantLock subscribeLock = new ReentrantLock();
    private final AtomicBoolean started = new AtomicBoolean();
    private final AtomicBoolean closed = new AtomicBoolean();
    private volatile boolean ready;
    /** while true the reconnect loop parks instead of connecting (a rehearsal's refused reconnect) */
    private volatile boolean reconnectHeld;
    private final AtomicBoolean parkedWhileHeld = new AtomicBoolean();
    private boolean everConnected;
    private int attempt;

    /** @param clock stamps {@link InboundMessage#receivedNanos()} and paces drop warnings */
    public MqttLink(MqttLinkConfig config, Clock clock) {
        this.config = Objects.requireNonNull(config, "config");
        this.clock = Objects.requireNonNull(clock, "clock");
        for (Reason r : Reason.values()) {
            failures.put(r, new LongAdder());
        }
        this.receiveQueue = new ReceiveQueue(config.clientId(), config.receiveQueueCapacity(), subscriptions,
                counters, clock);
        this.backoff = new ReconnectBackoff(config.reconnectInitialMs(), config.reconnectMaxMs(),
                config.reconnectJitter(), new Random());
        this.reconnectThread = new ScheduledThreadPoolExecutor(1, r -> {
            Thread t = new Thread(r, "mqtt-connect-" + config.clientId());
            t.setDaemon(true);
            return t;
        });
        this.reconnectThread.setRemoveOnCancelPolicy(true);
        this.options = connectionOptions();
        try {
            // In-memory persistence: Paho's default writes files into the working directory.
            this.client = new MqttAsyncClient(config.serverUri(), config.clientId(), new MemoryPersistence());
        } catch (MqttException e) {
            throw new IllegalArgumentException("cannot create MQTT client for " + config + ": " + e.getMessage(), e);
        }
        client.setCallback(new PahoCallback());
        this.publisher = new LinkPublisher(client, inflight, counters, failures, config);
    }

    private MqttConnectionOptions connectionOptions() {
        MqttConnectionOptions o = new MqttConnectionOptions();
        o.setAutomaticReconnect(false);
        o.setCleanStart(config.cleanStart());
        o.setSessionExpiryInterval(config.sessionExpirySeconds());
        o.setKeepAliveInterval(config.keepAliveSeconds());
        o.setMaximumPacketSize((long) PacketLimits.MAX_PACKET_BYTES);
        o.setConnectionTimeout(Math.max(1, config.connectTimeoutMs() / 1000));
        config.username().ifPresent(o::setUserName);
        config.password().ifPresent(pw -> o.setPassword(new String(pw).getBytes(java.nio.charset.StandardCharsets.UTF_8)));
        o.setSocketFactory(config.isTls() ? sockets.tls(TlsSocketFactories.from(config)) : sockets.plain());
        config.lastWill().ifPresent(will -> {
            MqttMessage m = new MqttMessage(will.payload(), will.qos().level(), will.retained(), null);
            o.setWill(will.topic(), m);
        });
        return o;
    }

    /** Starts connecting in the background; reconnects until {@link #close()}. Idempotent. */
    public MqttLink start() {
        if (closed.get()) {
            throw new IllegalStateException(config.clientId() + ": link is closed");
        }
        if (started.compareAndSet(false, true)) {
            reconnectThread.execute(this::connectAttempt);
        }
        return this;
    }

    /**
     * Waits until the link is connected and resubscribed.
     *
     * @param timeoutMs ≥ 0
     * @return true when connected within the time
     */
    public boolean awaitConnected(long timeoutMs) throws InterruptedException {
        long leftNanos = TimeUnit.MILLISECONDS.toNanos(timeoutMs);
        stateLock.lock();
        try {
            while (!ready && leftNanos > 0 && !closed.get()) {
                leftNanos = connectedChanged.awaitNanos(leftNanos);
            }
            return ready;
        } finally {
            stateLock.unlock();
        }
    }

    // ----- connecting (reconnect thread only) -----

    private void connectAttempt() {
        if (closed.get() || ready) {
            return;
        }
        if (reconnectHeld) {
            parkedWhileHeld.set(true);
            // released between the two reads: whoever takes the parked flag goes on connecting
            if (reconnectHeld || !parkedWhileHeld.getAndSet(false)) {
                return;
            }
        }
        try {
            IMqttToken token = client.connect(options);
            token.waitForCompletion(config.connectTimeoutMs());
            MqttProperties props = token.getResponseProperties();
            Integer receiveMaximum = props == null ? null : props.getReceiveMaximum();
            inflight.resize(receiveMaximum == null ? DEFAULT_RECEIVE_MAXIMUM : receiveMaximum);
            resubscribeAll();
        } catch (MqttException | RuntimeException e) {
            long delayMs = backoff.delayMs(Math.min(attempt, 30));
            attempt++;
            LOG.info("{}: connect to {} failed ({}), retry #{} in {} ms", config.clientId(), config.serverUri(),
                    e.getMessage(), attempt, delayMs);
            if (client.isConnected()) {
                forceDisconnect();
            }
            schedule(this::connectAttempt, delayMs);
            return;
        }
        attempt = 0;
        boolean reconnect = everConnected;
        everConnected = true;
        if (reconnect) {
            counters.onReconnect();
        }
        setReady(true);
        LOG.info("{}: connected to {} (in-flight limit {})", config.clientId(), config.serverUri(), inflight.limit());
        for (ConnectionListener l : connectionListeners) {
            try {
                l.onConnected(reconnect);
            } catch (RuntimeException e) {
                LOG.warn("{}: connection listener failed: {}", config.clientId(), e.toString());
            }
        }
    }

    private void connectionLost(Throwable cause) {
        if (closed.get() || !markLost()) {
            return; // already lost (e.g. a clean disconnect of ours, or lost while connecting: that attempt retries)
        }
        LOG.warn("{}: connection to {} lost: {}", config.clientId(), config.serverUri(),
                cause == null ? "broker disconnected" : cause.getMessage());
        tellLostAndRetry(cause);
    }

    private void tellLostAndRetry(Throwable cause) {
        for (ConnectionListener l : connectionListeners) {
            try {
                l.onDisconnected(cause);
            } catch (RuntimeException e) {
                LOG.warn("{}: connection listener failed: {}", config.clientId(), e.toString());
            }
        }
        attempt = 0;
        schedule(this::connectAttempt, backoff.delayMs(0));
    }

    /** @return true if the link was ready and is now marked lost (exactly one caller wins) */
    private boolean markLost() {
        stateLock.lock();
        try {
            if (!ready) {
                return false;
            }
            ready = false;
            connectedChanged.signalAll();
            return true;
        } finally {
            stateLock.unlock();
        }
    }

    private void schedule(Runnable task, long delayMs) {
        try {
            reconnectThread.schedule(task, delayMs, TimeUnit.MILLISECONDS);
        } catch (RejectedExecutionException e) {
            // closing: nothing more to do
        }
    }

    private void setReady(boolean value) {
        stateLock.lock();
        try {
            ready = value;
            connectedChanged.signalAll();
        } finally {
            stateLock.unlock();
        }
    }

    private void resubscribeAll() throws MqttException {
        subscribeLock.lock();
        try {
            List<SubscriptionTable.Entry> entries = subscriptions.entries();
            if (entries.isEmpty()) {
                return;
            }
            MqttSubscription[] subs = entries.stream()
                    .map(e -> new MqttSubscription(e.filter(), e.qos().level())).toArray(MqttSubscription[]::new);
            IMqttToken token = client.subscribe(subs);
            token.waitForCompletion(config.operationTimeoutMs());
            checkGranted(token, entries.stream().map(SubscriptionTable.Entry::filter).toList());
        } finally {
            subscribeLock.unlock();
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

    // ----- MessageBus -----

    @Override
    public String clientId() {
        return config.clientId();
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        return publisher.publish(message, closed.get());
    }

    /**
     * {@inheritDoc} When connected, waits for the SUBACK (at most the operation timeout); otherwise the
     * subscription is made on the next connect.
     *
     * @throws IllegalArgumentException for a malformed filter
     */
    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        Objects.requireNonNull(qos, "qos");
        Objects.requireNonNull(listener, "listener");
        try {
            MqttTopicValidator.validate(topicFilter, true, true);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("bad topic filter '" + topicFilter + "': " + e.getMessage(), e);
        }
        subscribeLock.lock();
        try {
            if (!subscriptions.add(topicFilter, qos, listener) || !client.isConnected()) {
                return;
            }
            SubscriptionTable.Entry entry = subscriptions.get(topicFilter);
            IMqttToken token = client.subscribe(new MqttSubscription(topicFilter, entry.qos().level()));
            token.waitForCompletion(config.operationTimeoutMs());
            checkGranted(token, List.of(topicFilter));
        } catch (MqttException e) {
            // Kept in the table: it is made again after the next reconnect.
            LOG.warn("{}: subscribe to {} not confirmed yet ({}); retried after reconnect", config.clientId(),
                    topicFilter, e.getMessage());
        } finally {
            subscribeLock.unlock();
        }
    }

    @Override
    public void unsubscribe(String topicFilter) {
        subscribeLock.lock();
        try {
            if (subscriptions.remove(topicFilter) && client.isConnected()) {
                client.unsubscribe(topicFilter).waitForCompletion(config.operationTimeoutMs());
            }
        } catch (MqttException e) {
            LOG.warn("{}: unsubscribe from {} failed: {}", config.clientId(), topicFilter, e.getMessage());
        } finally {
            subscribeLock.unlock();
        }
    }

    /** @return true while connected and resubscribed */
    @Override
    public boolean isConnected() {
        return ready && client.isConnected();
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        connectionListeners.add(Objects.requireNonNull(listener, "listener"));
    }

    @Override
    public BusCounters counters() {
        return counters;
    }

    /** @return publishes that failed for this reason since start */
    public long failures(Reason reason) {
        return failures.get(reason).sum();
    }

    /** @return the QoS 1 in-flight limit taken from the last CONNACK's Receive Maximum (0 before) */
    public int inflightLimit() {
        return inflight.limit();
    }

    /** @return messages waiting for the delivery thread */
    public int receiveBacklog() {
        return receiveQueue.backlog();
    }

    public MqttLinkConfig config() {
        return config;
    }

    /** @return the TCP socket of the current connection (tests check TCP_NODELAY), or null */
    public Socket socketForTest() {
        return sockets.lastSocket();
    }

    /** Same as {@link #disconnectAbruptly()}; kept for the tests that use it. */
    public void killForTest() {
        disconnectAbruptly();
    }

    /**
     * Cuts the TCP connection without an MQTT DISCONNECT, as a network failure or a killed process would:
     * the broker publishes the last will, and this link reconnects by itself (unless reconnecting is
     * held, {@link #holdReconnect}). Returns at once; listeners hear of the loss when Paho notices it.
     */
    public void disconnectAbruptly() {
        Socket s = sockets.lastSocket();
        if (s != null) {
            try {
                s.close();
            } catch (IOException e) {
                LOG.debug("closing socket: {}", e.toString());
            }
        }
    }

    /**
     * Sends DISCONNECT (the broker discards the last will) and then behaves as after a lost connection:
     * listeners are told, and the link reconnects by itself unless reconnecting is held. Runs on the
     * link's reconnect thread; returns at once.
     */
    public void disconnectCleanly() {
        try {
            reconnectThread.execute(() -> {
                if (closed.get() || !markLost()) {
                    return;
                }
                try {
                    client.disconnect(Math.min(1000, config.operationTimeoutMs())).waitForCompletion(config.operationTimeoutMs());
                } catch (MqttException e) {
                    LOG.debug("{}: clean disconnect failed: {}", config.clientId(), e.getMessage());
                    forceDisconnect();
                }
                LOG.info("{}: disconnected on request", config.clientId());
                tellLostAndRetry(null);
            });
        } catch (RejectedExecutionException e) {
            // closing
        }
    }

    /**
     * Holds (true) or releases (false) the reconnect loop: while held, a lost link stays down; on release
     * it connects again at once. Connected links are not affected.
     */
    public void holdReconnect(boolean hold) {
        reconnectHeld = hold;
        if (!hold && parkedWhileHeld.getAndSet(false)) {
            schedule(this::connectAttempt, 0);
        }
    }

    /** Disconnects cleanly (the broker discards the last will); bounded by the operation timeout. */
    @Override
    public void close() {
        if (!closed.compareAndSet(false, true)) {
            return;
        }
        reconnectThread.shutdownNow();
        boolean wasReady = ready;
        setReady(false);
        try {
            if (client.isConnected()) {
                client.disconnect(Math.min(1000, config.operationTimeoutMs())).waitForCompletion(config.operationTimeoutMs());
            }
        } catch (MqttException e) {
            LOG.debug("{}: clean disconnect failed: {}", config.clientId(), e.getMessage());
            forceDisconnect();
        }
        try {
            client.close(true);
        } catch (MqttException e) {
            LOG.debug("{}: close: {}", config.clientId(), e.getMessage());
        }
        try {
            reconnectThread.awaitTermination(config.operationTimeoutMs(), TimeUnit.MILLISECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        receiveQueue.close(1000);
        if (wasReady) {
            for (ConnectionListener l : connectionListeners) {
                try {
                    l.onDisconnected(null);
                } catch (RuntimeException e) {
                    LOG.warn("{}: connection listener failed: {}", config.clientId(), e.toString());
                }
            }
        }
        LOG.info("{}: closed ({})", config.clientId(), counters);
    }

    private void forceDisconnect() {
        try {
            client.disconnectForcibly(0, Math.min(1000, config.operationTimeoutMs()), false);
        } catch (MqttException e) {
            LOG.debug("{}: forced disconnect: {}", config.clientId(), e.getMessage());
        }
    }

    /** Paho's callbacks: each returns at once; real work happens on the link's own threads. */
    private final class PahoCallback implements MqttCallback {
        @Override
        public void disconnected(MqttDisconnectResponse response) {
            Throwable cause = response.getException();
            try {
                reconnectThread.execute(() -> connectionLost(cause));
            } catch (RejectedExecutionException e) {
                // closing
            }
        }

        @Override
        public void mqttErrorOccurred(MqttException exception) {
            LOG.warn("{}: MQTT error: {}", config.clientId(), exception.getMessage());
        }

        @Override
        public void messageArrived(String topic, MqttMessage message) {
            receiveQueue.offer(new InboundMessage(topic, message.getPayload(),
                    message.getQos() >= 1 ? Qos.AT_LEAST_ONCE : Qos.AT_MOST_ONCE, message.isRetained(),
                    message.isDuplicate(), clock.monotonicNanos()));
        }

        @Override
        public void deliveryComplete(IMqttToken token) {
            // completion is handled by the publish's own action listener
        }

        @Override
        public void connectComplete(boolean reconnect, String serverUri) {
            // the link's own thread reports connections, after resubscribing
        }

        @Override
        public void authPacketArrived(int reasonCode, MqttProperties properties) {
            // no enhanced authentication
        }
    }
}
