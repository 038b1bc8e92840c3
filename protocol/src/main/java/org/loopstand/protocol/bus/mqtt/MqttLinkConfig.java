package org.loopstand.protocol.bus.mqtt;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import javax.net.ssl.SSLSocketFactory;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;

/**
 * Everything an {@link MqttLink} needs to connect. Immutable; made with {@link #builder()}, which
 * checks all settings in {@link Builder#build()} and names every one that is wrong.
 */
public final class MqttLinkConfig {
    private final String serverUri;
    private final BrokerEndpoints endpoints;
    private final String clientId;
    private final String username;
    private final char[] password;
    private final Path trustStorePath;
    private final char[] trustStorePassword;
    private final Path keyStorePath;
    private final char[] keyStorePassword;
    private final SSLSocketFactory sslSocketFactory;
    private final long sessionExpirySeconds;
    private final int keepAliveSeconds;
    private final boolean cleanStart;
    private final OutboundMessage lastWill;
    private final long reconnectInitialMs;
    private final long reconnectMaxMs;
    private final double reconnectJitter;
    private final int receiveQueueCapacity;
    private final int connectTimeoutMs;
    private final int operationTimeoutMs;

    private MqttLinkConfig(Builder b) {
        endpoints = BrokerEndpoints.parse(b.serverUri);
        serverUri = endpoints.toString();
        clientId = b.clientId;
        username = b.username;
        password = b.password == null ? null : b.password.clone();
        trustStorePath = b.trustStorePath;
        trustStorePassword = b.trustStorePassword == null ? null : b.trustStorePassword.clone();
        keyStorePath = b.keyStorePath;
        keyStorePassword = b.keyStorePassword == null ? null : b.keyStorePassword.clone();
        sslSocketFactory = b.sslSocketFactory;
        sessionExpirySeconds = b.sessionExpirySeconds;
        keepAliveSeconds = b.keepAliveSeconds;
        cleanStart = b.cleanStart;
        lastWill = b.lastWill;
        reconnectInitialMs = b.reconnectInitialMs;
        reconnectMaxMs = b.reconnectMaxMs;
        reconnectJitter = b.reconnectJitter;
        receiveQueueCapacity = b.receiveQueueCapacity;
        connectTimeoutMs = b.connectTimeoutMs;
        operationTimeoutMs = b.operationTimeoutMs;
    }

    public static Builder builder() {
        return new Builder();
    }

    /** @return broker address, tcp://host:port or ssl://host:port, or the nodes' comma-separated list */
    public String serverUri() {
        return serverUri;
    }

    /** @return the broker nodes in failover order (one for a single broker) */
    public BrokerEndpoints endpoints() {
        return endpoints;
    }

    public String clientId() {
        return clientId;
    }

    public Optional<String> username() {
        return Optional.ofNullable(username);
    }

    /** @return a copy of the password, or empty */
    public Optional<char[]> password() {
        return Optional.ofNullable(password).map(char[]::clone);
    }

    public boolean isTls() {
        return serverUri.startsWith("ssl://");
    }

    public Optional<Path> trustStorePath() {
        return Optional.ofNullable(trustStorePath);
    }

    Optional<char[]> trustStorePassword() {
        return Optional.ofNullable(trustStorePassword).map(char[]::clone);
    }

    public Optional<Path> keyStorePath() {
        return Optional.ofNullable(keyStorePath);
    }

    Optional<char[]> keyStorePassword() {
        return Optional.ofNullable(keyStorePassword).map(char[]::clone);
    }

    /** @return a TLS socket factory given by the application, instead of trust/key store files */
    public Optional<SSLSocketFactory> sslSocketFactory() {
        return Optional.ofNullable(sslSocketFactory);
    }

    /** @return how long the broker keeps the session after a disconnect, s; 0 = ends with the connection */
    public long sessionExpirySeconds() {
        return sessionExpirySeconds;
    }

    /** @return MQTT keep alive, s; 0 = off */
    public int keepAliveSeconds() {
        return keepAliveSeconds;
    }

    /** @return true to discard any session the broker holds for this client id on connect */
    public boolean cleanStart() {
        return cleanStart;
    }

    /** @return the message the broker publishes when this client vanishes without DISCONNECT */
    public Optional<OutboundMessage> lastWill() {
        return Optional.ofNullable(lastWill);
    }

    /** @return first reconnect delay, ms */
    public long reconnectInitialMs() {
        return reconnectInitialMs;
    }

    /** @return largest reconnect delay before jitter, ms */
    public long reconnectMaxMs() {
        return reconnectMaxMs;
    }

    /** @return relative jitter of reconnect delays, [0, 1) */
    public double reconnectJitter() {
        return reconnectJitter;
    }

    /** @return messages that may wait for the application's delivery thread before new ones are dropped */
    public int receiveQueueCapacity() {
        return receiveQueueCapacity;
    }

    /** @return how long one connect attempt may take, ms */
    public int connectTimeoutMs() {
        return connectTimeoutMs;
    }

    /** @return how long subscribe and disconnect wait for the broker, ms */
    public int operationTimeoutMs() {
        return operationTimeoutMs;
    }

    @Override
    public String toString() {
        return "MqttLinkConfig[" + serverUri + " clientId=" + clientId + " cleanStart=" + cleanStart
                + " sessionExpiryS=" + sessionExpirySeconds + " keepAliveS=" + keepAliveSeconds + "]";
    }

    /** Collects settings; {@link #build()} validates them all at once. */
    public static final class Builder {
        private String serverUri;
        private String clientId;
        private String username;
        private char[] password;
        private Path trustStorePath;
        private char[] trustStorePassword;
        private Path keyStorePath;
        private char[] keyStorePassword;
        private SSLSocketFactory sslSocketFactory;
        private long sessionExpirySeconds = 300;
        private int keepAliveSeconds = 30;
        private boolean cleanStart = false;
        private OutboundMessage lastWill;
        private long reconnectInitialMs = 250;
        private long reconnectMaxMs = 10_000;
        private double reconnectJitter = 0.2;
        private int receiveQueueCapacity = 10_000;
        private int connectTimeoutMs = 5_000;
        private int operationTimeoutMs = 5_000;

        private Builder() {
        }

        /**
         * @param serverUri tcp://host:port or ssl://host:port, or a comma-separated list of the nodes of one
         *                  broker cluster in failover order ({@link BrokerEndpoints})
         */
        public Builder serverUri(String serverUri) {
            this.serverUri = serverUri;
            return this;
        }

        public Builder clientId(String clientId) {
            this.clientId = clientId;
            return this;
        }

        /** @param password copied; the caller may wipe its array afterwards */
        public Builder credentials(String username, char[] password) {
            this.username = username;
            this.password = password == null ? null : password.clone();
            return this;
        }

        /** @param path PKCS12 (.p12/.pfx) or JKS trust store with the broker's CA */
        public Builder trustStore(Path path, char[] storePassword) {
            this.trustStorePath = path;
            this.trustStorePassword = storePassword == null ? null : storePassword.clone();
            return this;
        }

        /** @param path PKCS12 (.p12/.pfx) or JKS key store with this client's certificate and key */
        public Builder keyStore(Path path, char[] storePassword) {
            this.keyStorePath = path;
            this.keyStorePassword = storePassword == null ? null : storePassword.clone();
            return this;
        }

        /** A ready TLS socket factory, instead of store files (TCP_NODELAY is still added). */
        public Builder sslSocketFactory(SSLSocketFactory factory) {
            this.sslSocketFactory = factory;
            return this;
        }

        /** @param seconds 0..4294967295; default 300 */
        public Builder sessionExpirySeconds(long seconds) {
            this.sessionExpirySeconds = seconds;
            return this;
        }

        /** @param seconds 0..65535; default 30 */
        public Builder keepAliveSeconds(int seconds) {
            this.keepAliveSeconds = seconds;
            return this;
        }

        /** @param cleanStart default false: resume the broker-held session and its queued QoS 1 messages */
        public Builder cleanStart(boolean cleanStart) {
            this.cleanStart = cleanStart;
            return this;
        }

        /** Last will: published by the broker when this client disappears without a clean DISCONNECT. */
        public Builder lastWill(String topic, byte[] payload, Qos qos, boolean retained) {
            this.lastWill = new OutboundMessage(topic, payload, qos, retained, 0);
            return this;
        }

        /** @param initialMs first delay &gt; 0; @param maxMs cap ≥ initialMs; @param jitter in [0, 1) */
        public Builder reconnectBackoff(long initialMs, long maxMs, double jitter) {
            this.reconnectInitialMs = initialMs;
            this.reconnectMaxMs = maxMs;
            this.reconnectJitter = jitter;
            return this;
        }

        /** @param capacity ≥ 1; default 10000 */
        public Builder receiveQueueCapacity(int capacity) {
            this.receiveQueueCapacity = capacity;
            return this;
        }

        /** @param connectTimeoutMs ≥ 100; default 5000 */
        public Builder connectTimeoutMs(int connectTimeoutMs) {
            this.connectTimeoutMs = connectTimeoutMs;
            return this;
        }

        /** @param operationTimeoutMs ≥ 100; default 5000 */
        public Builder operationTimeoutMs(int operationTimeoutMs) {
            this.operationTimeoutMs = operationTimeoutMs;
            return this;
        }

        /** @throws IllegalArgumentException naming every setting that is wrong */
        public MqttLinkConfig build() {
            List<String> problems = new ArrayList<>();
            checkServerUri(problems);
            if (clientId == null || clientId.isEmpty()) {
                problems.add("clientId is missing");
            } else if (clientId.getBytes(StandardCharsets.UTF_8).length > 65_535) {
                problems.add("clientId is longer than 65535 bytes");
            }
            if (password != null && username == null) {
                problems.add("a password needs a username");
            }
            checkTls(problems);
            if (sessionExpirySeconds < 0 || sessionExpirySeconds > 0xFFFF_FFFFL) {
                problems.add("sessionExpirySeconds must be in [0, 4294967295], got " + sessionExpirySeconds);
            }
            if (keepAliveSeconds < 0 || keepAliveSeconds > 65_535) {
                problems.add("keepAliveSeconds must be in [0, 65535], got " + keepAliveSeconds);
            }
            if (lastWill != null && (lastWill.topic().isEmpty() || lastWill.topic().contains("+")
                    || lastWill.topic().contains("#"))) {
                problems.add("last will topic must be a non-empty topic without wildcards, got '"
                        + lastWill.topic() + "'");
            }
            if (reconnectInitialMs <= 0) {
                problems.add("reconnect initial delay must be > 0 ms, got " + reconnectInitialMs);
            }
            if (reconnectMaxMs < reconnectInitialMs) {
                problems.add("reconnect max delay (" + reconnectMaxMs + " ms) must be ≥ initial delay ("
                        + reconnectInitialMs + " ms)");
            }
            if (!(reconnectJitter >= 0 && reconnectJitter < 1)) {
                problems.add("reconnect jitter must be in [0, 1), got " + reconnectJitter);
            }
            if (receiveQueueCapacity < 1) {
                problems.add("receiveQueueCapacity must be ≥ 1, got " + receiveQueueCapacity);
            }
            if (connectTimeoutMs < 100) {
                problems.add("connectTimeoutMs must be ≥ 100, got " + connectTimeoutMs);
            }
            if (operationTimeoutMs < 100) {
                problems.add("operationTimeoutMs must be ≥ 100, got " + operationTimeoutMs);
            }
            if (!problems.isEmpty()) {
                throw new IllegalArgumentException("invalid MQTT link configuration: " + String.join("; ", problems));
            }
            return new MqttLinkConfig(this);
        }

        private void checkServerUri(List<String> problems) {
            BrokerEndpoints.parse(serverUri, problems);
        }

        private void checkTls(List<String> problems) {
            boolean storesGiven = trustStorePath != null || keyStorePath != null;
            boolean tls = serverUri != null && serverUri.strip().startsWith("ssl://");
            if ((storesGiven || sslSocketFactory != null) && !tls) {
                problems.add("TLS settings need an ssl:// serverUri, got '" + serverUri + "'");
            }
            if (storesGiven && sslSocketFactory != null) {
                problems.add("give either trust/key store files or an SSLSocketFactory, not both");
            }
            checkStore("trust store", trustStorePath, problems);
            checkStore("key store", keyStorePath, problems);
        }

        private static void checkStore(String what, Path path, List<String> problems) {
            if (path != null && !Files.isReadable(path)) {
                problems.add(what + " " + path + " does not exist or is not readable");
            }
        }
    }
}
