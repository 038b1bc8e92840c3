package org.loopstand.protocol.bus.mqtt;

import java.io.IOException;
import java.net.Socket;
import java.util.EnumMap;
import java.util.Map;
import java.util.Objects;
import java.util.Random;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ScheduledThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.LongAdder;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
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
 * <p>Several broker nodes ({@link BrokerEndpoints}, a comma-separated {@code serverUri}): the link walks
 * them in list order ({@link FailoverCursor}), every attempt bounded by the connect timeout including the
 * CONNACK, and starts a clean session on a node other than the last one, so QoS 1 publishes still in
 * flight towards the old node fail instead of going out late on the new one.
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
    private final LinkOptions options;
    private final SubscriptionTable subscriptions = new SubscriptionTable();
    private final LinkSubscriptions subscribing;
    private final FailoverCursor cursor;
    private final ReceiveQueue receiveQueue;
    private final InflightGate inflight = new InflightGate();
    private final LinkPublisher publisher;
    private final ScheduledThreadPoolExecutor reconnectThread;
    private final LinkListeners connectionListeners;
    private final AtomicBoolean started = new AtomicBoolean();
    private final AtomicBoolean closed = new AtomicBoolean();
    private final ReadyFlag ready = new ReadyFlag();
    /** while true the reconnect loop parks instead of connecting (a rehearsal's refused reconnect) */
    private volatile boolean reconnectHeld;
    private final AtomicBoolean parkedWhileHeld = new AtomicBoolean();
    private boolean everConnected;
    private volatile String connectedUri;

    /** @param clock stamps {@link InboundMessage#receivedNanos()} and paces drop warnings */
    public MqttLink(MqttLinkConfig config, Clock clock) {
        this.config = Objects.requireNonNull(config, "config");
        this.clock = Objects.requireNonNull(clock, "clock");
        for (Reason r : Reason.values()) {
            failures.put(r, new LongAdder());
        }
        this.receiveQueue = new ReceiveQueue(config.clientId(), config.receiveQueueCapacity(), subscriptions,
                counters, clock);
        this.connectionListeners = new LinkListeners(config.clientId());
        this.cursor = new FailoverCursor(config.endpoints(), new ReconnectBackoff(config.reconnectInitialMs(),
                config.reconnectMaxMs(), config.reconnectJitter(), new Random()));
        this.reconnectThread = new ScheduledThreadPoolExecutor(1, r -> {
            Thread t = new Thread(r, "mqtt-connect-" + config.clientId());
            t.setDaemon(true);
            return t;
        });
        this.reconnectThread.setRemoveOnCancelPolicy(true);
        this.options = new LinkOptions(config, sockets);
        try {
            // In-memory persistence: Paho's default writes files into the working directory.
            this.client = new MqttAsyncClient(config.endpoints().first(), config.clientId(), new MemoryPersistence());
        } catch (MqttException e) {
            throw new IllegalArgumentException("cannot create MQTT client for " + config + ": " + e.getMessage(), e);
        }
        client.setCallback(new PahoCallbacks(config.clientId(), receiveQueue, clock, this::onPahoDisconnected));
        this.subscribing = new LinkSubscriptions(client, config, subscriptions);
        this.publisher = new LinkPublisher(client, inflight, counters, failures, config);
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
        return ready.await(timeoutMs, closed::get);
    }

    // ----- connecting (reconnect thread only) -----

    private void connectAttempt() {
        if (closed.get() || ready.get()) {
            return;
        }
        if (reconnectHeld) {
            parkedWhileHeld.set(true);
            // released between the two reads: whoever takes the parked flag goes on connecting
            if (reconnectHeld || !parkedWhileHeld.getAndSet(false)) {
                return;
            }
        }
        String uri = cursor.uri();
        boolean cleanStart = config.cleanStart() || cursor.switchingNode();
        try {
            IMqttToken token = client.connect(options.forAttempt(uri, cleanStart));
            // bounds TCP connect and CONNACK together: a node that accepts TCP but never answers is left
            token.waitForCompletion(config.connectTimeoutMs());
            MqttProperties props = token.getResponseProperties();
            Integer receiveMaximum = props == null ? null : props.getReceiveMaximum();
            inflight.resize(receiveMaximum == null ? DEFAULT_RECEIVE_MAXIMUM : receiveMaximum);
            subscribing.resubscribeAll();
        } catch (MqttException | RuntimeException e) {
            // abort whatever is left of the attempt (a CONNECT still waiting for its CONNACK included),
            // else Paho refuses every later connect as "connect already in progress"
            forceDisconnect();
            long delayMs = cursor.failed();
            LOG.info("{}: connect to {} failed ({}), attempt #{}, next {} in {} ms", config.clientId(), uri,
                    e.getMessage(), cursor.failuresInRow(), cursor.uri(), delayMs);
            schedule(this::connectAttempt, delayMs);
            return;
        }
        String previousUri = cursor.lastConnectedUri();
        cursor.connected();
        connectedUri = uri;
        boolean reconnect = everConnected;
        everConnected = true;
        if (reconnect) {
            counters.onReconnect();
        }
        if (previousUri != null && !previousUri.equals(uri)) {
            LOG.warn("{}: failed over from {} to {} (clean session: in-flight QoS 1 publishes to the old node dropped)",
                    config.clientId(), previousUri, uri);
        }
        ready.set(true);
        LOG.info("{}: connected to {} (in-flight limit {})", config.clientId(), uri, inflight.limit());
        connectionListeners.connected(reconnect);
    }

    private void connectionLost(Throwable cause) {
        if (closed.get() || !ready.clearIfSet()) {
            return; // already lost (e.g. a clean disconnect of ours, or lost while connecting: that attempt retries)
        }
        LOG.warn("{}: connection to {} lost: {}", config.clientId(), connectedUri,
                cause == null ? "broker disconnected" : cause.getMessage());
        tellLostAndRetry(cause);
    }

    private void tellLostAndRetry(Throwable cause) {
        connectionListeners.disconnected(cause);
        connectedUri = null;
        schedule(this::connectAttempt, cursor.lost());
    }

    private void schedule(Runnable task, long delayMs) {
        try {
            reconnectThread.schedule(task, delayMs, TimeUnit.MILLISECONDS);
        } catch (RejectedExecutionException e) {
            // closing: nothing more to do
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
        subscribing.subscribe(topicFilter, qos, listener);
    }

    @Override
    public void unsubscribe(String topicFilter) {
        subscribing.unsubscribe(topicFilter);
    }

    /** @return true while connected and resubscribed */
    @Override
    public boolean isConnected() {
        return ready.get() && client.isConnected();
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        connectionListeners.add(listener);
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

    /** @return the broker node this link is connected to now, or null while disconnected */
    public String connectedUri() {
        return ready.get() ? connectedUri : null;
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
                if (closed.get() || !ready.clearIfSet()) {
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
        boolean wasReady = ready.get();
        ready.set(false);
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
            connectionListeners.disconnected(null);
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

    /** From Paho's thread: hands the loss to the reconnect thread. */
    private void onPahoDisconnected(Throwable cause) {
        try {
            reconnectThread.execute(() -> connectionLost(cause));
        } catch (RejectedExecutionException e) {
            // closing
        }
    }
}
