package org.loopstand.bench.raw;

import java.io.IOException;
import java.net.InetAddress;
import java.net.Socket;
import java.nio.ByteBuffer;
import java.util.Arrays;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.LongAdder;
import java.util.concurrent.locks.LockSupport;
import javax.net.SocketFactory;
import org.HdrHistogram.Recorder;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.loopstand.protocol.time.Clock;

/**
 * The yardstick: a bare Paho v5 publisher and subscriber (TCP_NODELAY, in-memory persistence, nothing
 * else) in the same JVM, publishing payloads of the rig's telemetry size at the rig's telemetry rate,
 * with the send time (monotonic ns) in the first 8 bytes. Messages go out in slots: at each slot
 * boundary every message due by then is sent at once, so 1 ms slots spread them evenly and slots of
 * the plant's physics step send them in the plant's own burst pattern (one burst per step). Latency =
 * messageArrived time − send time. The callback only records and returns.
 */
public final class RawPahoLoop implements AutoCloseable {
    private final Clock clock;
    private final double ratePerS;
    private final int payloadBytes;
    private final int qos;
    private final String topicPrefix;
    private final long slotNanos;
    private final MqttAsyncClient publisher;
    private final MqttAsyncClient subscriber;
    private final Recorder roundTripUs = new Recorder(3);
    private final LongAdder sent = new LongAdder();
    private final LongAdder received = new LongAdder();
    private final LongAdder failed = new LongAdder();
    private final AtomicBoolean running = new AtomicBoolean();
    private Thread thread;

    /**
     * @param ratePerS     messages per second, > 0
     * @param payloadBytes payload size, ≥ 8
     * @param qos          0 or 1
     * @param slotNanos    time between bursts, ns, ≥ 100 µs (1 ms: spread; the physics step: as the plant)
     */
    public RawPahoLoop(String serverUri, String clientPrefix, String topicPrefix, double ratePerS, int payloadBytes,
                       int qos, long slotNanos, Clock clock) throws MqttException {
        if (!(ratePerS > 0) || payloadBytes < 8 || qos < 0 || qos > 1 || slotNanos < 100_000) {
            throw new IllegalArgumentException("rate > 0, payload ≥ 8 bytes, QoS 0 or 1, slot ≥ 100 µs needed");
        }
        this.slotNanos = slotNanos;
        this.clock = clock;
        this.ratePerS = ratePerS;
        this.payloadBytes = payloadBytes;
        this.qos = qos;
        this.topicPrefix = topicPrefix;
        this.publisher = new MqttAsyncClient(serverUri, clientPrefix + "-pub", new MemoryPersistence());
        this.subscriber = new MqttAsyncClient(serverUri, clientPrefix + "-sub", new MemoryPersistence());
    }

    public RawPahoLoop start() throws MqttException {
        subscriber.setCallback(new Callback());
        subscriber.connect(options()).waitForCompletion(10_000);
        subscriber.subscribe(topicPrefix + "/#", qos).waitForCompletion(10_000);
        publisher.connect(options()).waitForCompletion(10_000);
        running.set(true);
        thread = new Thread(this::publishLoop, "raw-paho-publisher");
        thread.setDaemon(true);
        thread.start();
        return this;
    }

    private static MqttConnectionOptions options() {
        MqttConnectionOptions o = new MqttConnectionOptions();
        o.setCleanStart(true);
        o.setAutomaticReconnect(false);
        o.setSocketFactory(new NoDelayFactory());
        return o;
    }

    private void publishLoop() {
        long start = clock.monotonicNanos();
        long slotEnd = start + slotNanos;
        long done = 0;
        byte[] filler = new byte[payloadBytes];
        Arrays.fill(filler, (byte) 'x');
        while (running.get()) {
            for (long now = clock.monotonicNanos(); now < slotEnd && running.get(); now = clock.monotonicNanos()) {
                LockSupport.parkNanos(slotEnd - now);
            }
            long due = (long) ((slotEnd - start) / 1e9 * ratePerS);
            while (done < due && running.get()) {
                byte[] p = filler.clone();
                ByteBuffer.wrap(p).putLong(clock.monotonicNanos());
                try {
                    publisher.publish(topicPrefix + "/u" + (done % 1000) + "/telemetry", new MqttMessage(p, qos, false, null));
                    sent.increment();
                } catch (MqttException e) {
                    failed.increment(); // 32202 / 32001: the client is full; the slot is skipped, not retried
                }
                done++;
            }
            slotEnd += slotNanos;
        }
    }

    public Recorder roundTripUs() { return roundTripUs; }
    public long sent() { return sent.sum(); }
    public long received() { return received.sum(); }
    public long failed() { return failed.sum(); }

    @Override
    public void close() {
        running.set(false);
        if (thread != null) {
            try {
                thread.join(2_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        for (MqttAsyncClient c : new MqttAsyncClient[] {publisher, subscriber}) {
            try {
                if (c.isConnected()) {
                    c.disconnect(1000).waitForCompletion(2000);
                }
                c.close(true);
            } catch (MqttException e) {
                // closing anyway
            }
        }
    }

    private final class Callback implements MqttCallback {
        @Override
        public void messageArrived(String topic, MqttMessage message) {
            long now = clock.monotonicNanos();
            long sentNanos = ByteBuffer.wrap(message.getPayload()).getLong();
            roundTripUs.recordValue(Math.max(0, (now - sentNanos) / 1000));
            received.increment();
        }

        @Override public void disconnected(MqttDisconnectResponse r) { }
        @Override public void mqttErrorOccurred(MqttException e) { }
        @Override public void deliveryComplete(IMqttToken token) { }
        @Override public void connectComplete(boolean reconnect, String serverUri) { }
        @Override public void authPacketArrived(int reasonCode, MqttProperties properties) { }
    }

    /** Plain sockets with TCP_NODELAY, as the rig's link uses (Paho never sets it). */
    private static final class NoDelayFactory extends SocketFactory {
        private static Socket nd(Socket s) throws IOException {
            s.setTcpNoDelay(true);
            return s;
        }

        @Override public Socket createSocket() throws IOException { return nd(new Socket()); }
        @Override public Socket createSocket(String h, int p) throws IOException { return nd(new Socket(h, p)); }
        @Override public Socket createSocket(String h, int p, InetAddress la, int lp) throws IOException {
            return nd(new Socket(h, p, la, lp));
        }
        @Override public Socket createSocket(InetAddress h, int p) throws IOException { return nd(new Socket(h, p)); }
        @Override public Socket createSocket(InetAddress h, int p, InetAddress la, int lp) throws IOException {
            return nd(new Socket(h, p, la, lp));
        }
    }
}
