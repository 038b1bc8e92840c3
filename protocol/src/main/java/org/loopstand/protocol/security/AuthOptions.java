package org.loopstand.protocol.security;

import java.nio.file.Path;
import java.util.Map;
import picocli.CommandLine.Option;

/**
 * Security options shared by every process that connects to the broker ({@code plant}, {@code unit},
 * {@code control}, {@code pulse-test}): broker credentials, TLS stores, command keys and
 * {@code --insecure}. Passwords are only ever read from files, never taken on the command line.
 * {@link #resolve} turns them into a {@link LinkSecurity} after {@link AuthPolicy#decide}.
 */
public final class AuthOptions {
    @Option(names = "--insecure", description = "run without broker auth, TLS or command signing (loopback broker only; prints a banner)")
    boolean insecure;

    @Option(names = "--username", description = "broker username of this process")
    String username;

    @Option(names = "--password-file", paramLabel = "FILE", description = "file whose first line is the broker password of --username")
    Path passwordFile;

    @Option(names = "--credentials-file", paramLabel = "FILE",
            description = "users file (username = password a line) for a process holding several identities (plant: 'plant' and 'unit-<id>')")
    Path credentialsFile;

    @Option(names = "--keys", paramLabel = "FILE", description = "command keys file (default: $" + KeyRing.KEYS_FILE_ENV + ")")
    Path keysFile;

    @Option(names = "--trust-store", paramLabel = "FILE", description = "PKCS#12 (.p12) or JKS trust store with the site CA (ssl:// brokers)")
    Path trustStore;

    @Option(names = "--trust-store-password-file", paramLabel = "FILE", description = "file holding the trust store password")
    Path trustStorePasswordFile;

    @Option(names = "--key-store", paramLabel = "FILE", description = "PKCS#12 (.p12) or JKS key store with this process's client certificate")
    Path keyStore;

    @Option(names = "--key-store-password-file", paramLabel = "FILE", description = "file holding the key store password")
    Path keyStorePasswordFile;

    /** @return whether any security option was given on the command line */
    public boolean anyGiven() {
        return insecure || username != null || passwordFile != null || credentialsFile != null || keysFile != null
                || trustStore != null || keyStore != null || trustStorePasswordFile != null || keyStorePasswordFile != null;
    }

    /**
     * @param brokerUri the broker this process connects to
     * @param env       the process environment ({@code System.getenv()}), for {@value KeyRing#KEYS_FILE_ENV}
     * @return the settings to connect and sign/verify with
     * @throws SecuritySetupException when the process must not start (the message says what is missing)
     */
    public LinkSecurity resolve(String brokerUri, Map<String, String> env) throws SecuritySetupException {
        return LinkSecurity.resolve(this, brokerUri, env);
    }

    /** Builder-style setters for tests and in-process starts. */
    public AuthOptions insecure(boolean v) {
        insecure = v;
        return this;
    }

    public AuthOptions username(String v) {
        username = v;
        return this;
    }

    public AuthOptions passwordFile(Path v) {
        passwordFile = v;
        return this;
    }

    public AuthOptions credentialsFile(Path v) {
        credentialsFile = v;
        return this;
    }

    public AuthOptions keysFile(Path v) {
        keysFile = v;
        return this;
    }

    public AuthOptions trustStore(Path store, Path passwordFileOfStore) {
        trustStore = store;
        trustStorePasswordFile = passwordFileOfStore;
        return this;
    }

    public AuthOptions keyStore(Path store, Path passwordFileOfStore) {
        keyStore = store;
        keyStorePasswordFile = passwordFileOfStore;
        return this;
    }
}
