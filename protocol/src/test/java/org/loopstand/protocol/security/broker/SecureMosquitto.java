package org.loopstand.protocol.security.broker;

import static org.awaitility.Awaitility.await;

import java.io.IOException;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import javax.net.ssl.SSLSocketFactory;

/**
 * A real Mosquitto started by a test from the shipped config/broker/mosquitto-secure.conf with the
 * ACL and password file generated from a {@link BrokerAccessModel}, TLS with a throw-away CA, on a
 * free loopback port, in its own temp dir. Never touches the shared broker on 1883.
 */
public final class SecureMosquitto implements AutoCloseable {
    public static final Path MOSQUITTO = Path.of("/usr/sbin/mosquitto");

    private final Process process;
    private final int port;
    private final Path log;
    private final TestPki pki;
    private final Map<String, SSLSocketFactory> factories = new java.util.HashMap<>();

    private SecureMosquitto(Process process, int port, Path log, TestPki pki) {
        this.process = process;
        this.port = port;
        this.log = log;
        this.pki = pki;
    }

    /** Starts a broker for the model; every identity's password is {@link #passwordOf}. */
    public static SecureMosquitto start(BrokerAccessModel model, Path dir) throws Exception {
        TestPki pki = TestPki.newCa("loopstand-test-ca");
        TestPki.Issued server = pki.issueServer("loopstand-test-broker");
        Path ca = dir.resolve("ca.crt");
        Path cert = dir.resolve("server.crt");
        Path key = dir.resolve("server.key");
        TestPki.writeCertificate(pki.ca().certificate(), ca);
        TestPki.writeCertificate(server.certificate(), cert);
        TestPki.writePrivateKey(server.keys(), key);

        Map<String, String> passwords = new java.util.LinkedHashMap<>();
        model.identities().forEach(id -> passwords.put(id.username(), passwordOf(id.username())));
        Path acl = dir.resolve("acl");
        Path passwd = dir.resolve("passwd");
        MosquittoFiles.writeAclFile(model, acl);
        MosquittoFiles.writePasswordFile(MosquittoFiles.checkPasswords(passwords, model, "test"), passwd);

        int port = freePort();
        Path log = dir.resolve("mosquitto.log");
        String conf = MosquittoFiles.renderTemplate(Files.readString(shippedTemplate()), Map.of(
                "PASSWORD_FILE", passwd.toString(), "ACL_FILE", acl.toString(), "LOG_DEST", "file " + log,
                "TLS_PORT", Integer.toString(port), "BIND_ADDRESS", "127.0.0.1", "CA_FILE", ca.toString(),
                "CERT_FILE", cert.toString(), "KEY_FILE", key.toString()));
        Path confFile = dir.resolve("mosquitto.conf");
        // Debug logging shows denied publishes; "user" keeps mosquitto (started as this user) from
        // dropping to the "mosquitto" account, which could not read the temp dir.
        Files.writeString(confFile, conf + "log_type debug\nuser " + System.getProperty("user.name") + "\n");
        Process p = new ProcessBuilder(MOSQUITTO.toString(), "-c", confFile.toString())
                .redirectErrorStream(true).redirectOutput(dir.resolve("mosquitto.out").toFile()).start();
        SecureMosquitto broker = new SecureMosquitto(p, port, log, pki);
        try {
            await().atMost(Duration.ofSeconds(10)).pollInterval(Duration.ofMillis(20))
                    .until(() -> !p.isAlive() || broker.logText().contains("listen socket on port " + port));
            if (!p.isAlive()) {
                throw new IllegalStateException("mosquitto exited with " + p.exitValue() + ": "
                        + Files.readString(dir.resolve("mosquitto.out")) + broker.logText());
            }
        } catch (RuntimeException e) {
            broker.close();
            throw e;
        }
        return broker;
    }

    /** @return the deterministic test password of an identity (16+ characters) */
    public static String passwordOf(String username) {
        return "test-password-of-" + username;
    }

    public static Path shippedTemplate() {
        Path dir = Path.of("").toAbsolutePath();
        for (int i = 0; i < 4 && dir != null; i++, dir = dir.getParent()) {
            Path candidate = dir.resolve("config/broker/mosquitto-secure.conf");
            if (Files.exists(candidate)) {
                return candidate;
            }
        }
        throw new IllegalStateException("config/broker/mosquitto-secure.conf not found above " + Path.of("").toAbsolutePath());
    }

    public int port() {
        return port;
    }

    public String sslUri() {
        return "ssl://127.0.0.1:" + port;
    }

    public TestPki pki() {
        return pki;
    }

    /** @return a socket factory trusting this broker's CA and presenting a client cert from it */
    public synchronized SSLSocketFactory trustedClientFactory(String cn) throws Exception {
        SSLSocketFactory f = factories.get(cn);
        if (f == null) {
            f = TestPki.socketFactory(pki.ca().certificate(), pki.issueClient(cn));
            factories.put(cn, f);
        }
        return f;
    }

    public String logText() throws IOException {
        return Files.exists(log) ? Files.readString(log, StandardCharsets.UTF_8) : "";
    }

    public Path logFile() {
        return log;
    }

    private static int freePort() throws IOException {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            return s.getLocalPort();
        }
    }

    @Override
    public void close() throws InterruptedException {
        process.destroy();
        if (!process.waitFor(5, TimeUnit.SECONDS)) {
            process.destroyForcibly();
            process.waitFor(5, TimeUnit.SECONDS);
        }
    }
}
