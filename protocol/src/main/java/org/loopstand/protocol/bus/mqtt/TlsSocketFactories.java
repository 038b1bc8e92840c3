package org.loopstand.protocol.bus.mqtt;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.GeneralSecurityException;
import java.security.KeyStore;
import java.util.Locale;
import javax.net.ssl.KeyManagerFactory;
import javax.net.ssl.SSLContext;
import javax.net.ssl.SSLSocketFactory;
import javax.net.ssl.TrustManagerFactory;

/** Builds the TLS socket factory of a link from its trust and key store files. */
final class TlsSocketFactories {
    private TlsSocketFactories() {
    }

    static SSLSocketFactory from(MqttLinkConfig config) {
        if (config.sslSocketFactory().isPresent()) {
            return config.sslSocketFactory().get();
        }
        if (config.trustStorePath().isEmpty() && config.keyStorePath().isEmpty()) {
            return (SSLSocketFactory) SSLSocketFactory.getDefault();
        }
        try {
            TrustManagerFactory tmf = null;
            if (config.trustStorePath().isPresent()) {
                tmf = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
                tmf.init(load(config.trustStorePath().get(), config.trustStorePassword().orElse(null)));
            }
            KeyManagerFactory kmf = null;
            if (config.keyStorePath().isPresent()) {
                char[] pw = config.keyStorePassword().orElse(new char[0]);
                kmf = KeyManagerFactory.getInstance(KeyManagerFactory.getDefaultAlgorithm());
                kmf.init(load(config.keyStorePath().get(), pw), pw);
            }
            SSLContext context = SSLContext.getInstance("TLS");
            context.init(kmf == null ? null : kmf.getKeyManagers(), tmf == null ? null : tmf.getTrustManagers(), null);
            return context.getSocketFactory();
        } catch (GeneralSecurityException | IOException e) {
            throw new IllegalArgumentException("cannot set up TLS for " + config.serverUri() + ": " + e.getMessage(), e);
        }
    }

    private static KeyStore load(Path path, char[] password) throws GeneralSecurityException, IOException {
        String name = path.getFileName().toString().toLowerCase(Locale.ROOT);
        String type = name.endsWith(".jks") ? "JKS" : name.endsWith(".p12") || name.endsWith(".pfx")
                ? "PKCS12" : KeyStore.getDefaultType();
        KeyStore store = KeyStore.getInstance(type);
        try (InputStream in = Files.newInputStream(path)) {
            store.load(in, password);
        }
        return store;
    }
}
