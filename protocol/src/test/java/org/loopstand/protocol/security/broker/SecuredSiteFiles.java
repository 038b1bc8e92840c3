package org.loopstand.protocol.security.broker;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.Collection;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.TestKeys;

/**
 * The files an operator makes for a secured rehearsal, made for a {@link SecureMosquitto}: the users
 * file (every identity, its {@link SecureMosquitto#passwordOf} password), a keys file with key
 * {@code k1} per unit ({@link TestKeys}), a PKCS#12 trust store with the broker's CA, and one PKCS#12
 * key store per process with a client certificate from that CA, each with its password file.
 */
public final class SecuredSiteFiles {
    public static final String KEY_ID = "k1";
    private static final char[] STORE_PASSWORD = "store-password-for-tests".toCharArray();

    private final SecureMosquitto broker;
    private final Path dir;
    private final Path usersFile;
    private final Path keysFile;
    private final Path trustStore;
    private final Path storePasswordFile;

    private SecuredSiteFiles(SecureMosquitto broker, Path dir, Path usersFile, Path keysFile, Path trustStore,
            Path storePasswordFile) {
        this.broker = broker;
        this.dir = dir;
        this.usersFile = usersFile;
        this.keysFile = keysFile;
        this.trustStore = trustStore;
        this.storePasswordFile = storePasswordFile;
    }

    /** Writes the files into {@code dir} for the model's identities and these units. */
    public static SecuredSiteFiles write(SecureMosquitto broker, BrokerAccessModel model, Collection<String> units,
            Path dir) throws Exception {
        Files.createDirectories(dir);
        StringBuilder users = new StringBuilder("# test users\n");
        model.identities().forEach(id -> users.append(id.username()).append(" = ")
                .append(SecureMosquitto.passwordOf(id.username())).append('\n'));
        Path usersFile = Files.writeString(dir.resolve("users.properties"), users);
        StringBuilder keys = new StringBuilder("# test keys\n");
        for (String u : units) {
            keys.append(u).append('.').append(KEY_ID).append(" = ")
                    .append(Base64.getEncoder().encodeToString(TestKeys.bytes(u + "." + KEY_ID))).append('\n');
        }
        Path keysFile = Files.writeString(dir.resolve("keys.properties"), keys);
        Path trust = dir.resolve("trust.p12");
        TestPki.writeTrustStore(broker.pki().ca().certificate(), trust, STORE_PASSWORD);
        Path pw = Files.writeString(dir.resolve("store.password"), new String(STORE_PASSWORD) + "\n");
        return new SecuredSiteFiles(broker, dir, usersFile, keysFile, trust, pw);
    }

    public Path usersFile() {
        return usersFile;
    }

    public Path keysFile() {
        return keysFile;
    }

    /** @return a PKCS#12 key store with a client certificate named {@code cn} (made on first use) */
    public Path keyStoreFor(String cn) throws Exception {
        Path file = dir.resolve("client-" + cn + ".p12");
        if (!Files.exists(file)) {
            TestPki.writeKeyStore(broker.pki().issueClient(cn), file, STORE_PASSWORD);
        }
        return file;
    }

    /** @return options of a process holding several identities (plant): users file, keys, TLS */
    public AuthOptions multiIdentity(String clientCn) throws Exception {
        return new AuthOptions().credentialsFile(usersFile).keysFile(keysFile).trustStore(trustStore, storePasswordFile)
                .keyStore(keyStoreFor(clientCn), storePasswordFile);
    }

    /** @return options of a single-identity process: --username, --password-file, keys, TLS */
    public AuthOptions singleIdentity(String username) throws Exception {
        Path pw = Files.writeString(dir.resolve(username + ".password"), SecureMosquitto.passwordOf(username) + "\n");
        return new AuthOptions().username(username).passwordFile(pw).keysFile(keysFile)
                .trustStore(trustStore, storePasswordFile).keyStore(keyStoreFor(username), storePasswordFile);
    }
}
