package org.loopstand.protocol.security.broker;

import java.io.IOException;
import java.io.StringWriter;
import java.math.BigInteger;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.GeneralSecurityException;
import java.security.KeyPair;
import java.security.KeyPairGenerator;
import java.security.KeyStore;
import java.security.cert.X509Certificate;
import java.security.spec.ECGenParameterSpec;
import java.time.Duration;
import java.time.Instant;
import java.util.Date;
import java.util.concurrent.atomic.AtomicLong;
import javax.net.ssl.KeyManagerFactory;
import javax.net.ssl.SSLContext;
import javax.net.ssl.SSLSocketFactory;
import javax.net.ssl.TrustManagerFactory;
import org.bouncycastle.asn1.x500.X500Name;
import org.bouncycastle.asn1.x509.BasicConstraints;
import org.bouncycastle.asn1.x509.Extension;
import org.bouncycastle.asn1.x509.GeneralName;
import org.bouncycastle.asn1.x509.GeneralNames;
import org.bouncycastle.asn1.x509.KeyUsage;
import org.bouncycastle.cert.X509v3CertificateBuilder;
import org.bouncycastle.cert.jcajce.JcaX509CertificateConverter;
import org.bouncycastle.cert.jcajce.JcaX509v3CertificateBuilder;
import org.bouncycastle.openssl.jcajce.JcaPEMWriter;
import org.bouncycastle.operator.ContentSigner;
import org.bouncycastle.operator.jcajce.JcaContentSignerBuilder;

/**
 * A throw-away certificate authority made at test run time (EC P-256), so no key is ever
 * committed. Server certificates name 127.0.0.1 and localhost.
 */
public final class TestPki {
    /** A certificate with its private key. */
    public record Issued(X509Certificate certificate, KeyPair keys) {
    }

    private static final AtomicLong SERIAL = new AtomicLong(1);
    private final String name;
    private final Issued ca;

    private TestPki(String name, Issued ca) {
        this.name = name;
        this.ca = ca;
    }

    /** @return a new CA named {@code CN=<name>} */
    public static TestPki newCa(String name) throws Exception {
        KeyPair keys = ecKeys();
        X500Name subject = new X500Name("CN=" + name);
        X509v3CertificateBuilder b = builder(subject, subject, keys);
        b.addExtension(Extension.basicConstraints, true, new BasicConstraints(true));
        b.addExtension(Extension.keyUsage, true, new KeyUsage(KeyUsage.keyCertSign | KeyUsage.cRLSign));
        return new TestPki(name, new Issued(sign(b, keys), keys));
    }

    public Issued ca() {
        return ca;
    }

    /** @return a server certificate for 127.0.0.1 / localhost */
    public Issued issueServer(String cn) throws Exception {
        return issueServer(cn, "127.0.0.1");
    }

    /** @return a server certificate for this IP address and localhost (a host of a test's network namespace) */
    public Issued issueServer(String cn, String ipAddress) throws Exception {
        KeyPair keys = ecKeys();
        X509v3CertificateBuilder b = builder(new X500Name("CN=" + name), new X500Name("CN=" + cn), keys);
        b.addExtension(Extension.subjectAlternativeName, false, new GeneralNames(new GeneralName[] {
                new GeneralName(GeneralName.iPAddress, ipAddress), new GeneralName(GeneralName.dNSName, "localhost")}));
        b.addExtension(Extension.basicConstraints, true, new BasicConstraints(false));
        return new Issued(sign(b, ca.keys()), keys);
    }

    /** @return a client certificate for an identity */
    public Issued issueClient(String cn) throws Exception {
        KeyPair keys = ecKeys();
        X509v3CertificateBuilder b = builder(new X500Name("CN=" + name), new X500Name("CN=" + cn), keys);
        b.addExtension(Extension.basicConstraints, true, new BasicConstraints(false));
        return new Issued(sign(b, ca.keys()), keys);
    }

    /** Writes a certificate as PEM. */
    public static void writeCertificate(X509Certificate cert, Path file) throws IOException {
        writePem(cert, file);
    }

    /** Writes a private key as unencrypted PKCS#8 PEM (test only, in a temp dir). */
    public static void writePrivateKey(KeyPair keys, Path file) throws IOException {
        writePem(new org.bouncycastle.openssl.jcajce.JcaPKCS8Generator(keys.getPrivate(), null).generate(), file);
    }

    /**
     * @param trusted CA the client trusts for the server, or null for none
     * @param client  the client's certificate and key, or null to present none
     */
    public static SSLSocketFactory socketFactory(X509Certificate trusted, Issued client) throws GeneralSecurityException,
            IOException {
        KeyStore trust = KeyStore.getInstance("PKCS12");
        trust.load(null, null);
        if (trusted != null) {
            trust.setCertificateEntry("ca", trusted);
        }
        TrustManagerFactory tmf = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
        tmf.init(trust);
        KeyManagerFactory kmf = KeyManagerFactory.getInstance(KeyManagerFactory.getDefaultAlgorithm());
        KeyStore own = KeyStore.getInstance("PKCS12");
        own.load(null, null);
        char[] pw = "test".toCharArray();
        if (client != null) {
            own.setKeyEntry("client", client.keys().getPrivate(), pw, new X509Certificate[] {client.certificate()});
        }
        kmf.init(own, pw);
        SSLContext ctx = SSLContext.getInstance("TLSv1.2");
        ctx.init(kmf.getKeyManagers(), tmf.getTrustManagers(), null);
        return ctx.getSocketFactory();
    }

    /** Writes a PKCS#12 trust store holding the CA certificate (for --trust-store). */
    public static void writeTrustStore(X509Certificate ca, Path file, char[] password) throws GeneralSecurityException,
            IOException {
        KeyStore ks = KeyStore.getInstance("PKCS12");
        ks.load(null, null);
        ks.setCertificateEntry("ca", ca);
        try (var out = Files.newOutputStream(file)) {
            ks.store(out, password);
        }
    }

    /** Writes a PKCS#12 key store holding a client certificate and its key (for --key-store). */
    public static void writeKeyStore(Issued client, Path file, char[] password) throws GeneralSecurityException,
            IOException {
        KeyStore ks = KeyStore.getInstance("PKCS12");
        ks.load(null, null);
        ks.setKeyEntry("client", client.keys().getPrivate(), password, new X509Certificate[] {client.certificate()});
        try (var out = Files.newOutputStream(file)) {
            ks.store(out, password);
        }
    }

    private static void writePem(Object o, Path file) throws IOException {
        StringWriter s = new StringWriter();
        try (JcaPEMWriter w = new JcaPEMWriter(s)) {
            w.writeObject(o);
        }
        Files.writeString(file, s.toString());
    }

    private static KeyPair ecKeys() throws GeneralSecurityException {
        KeyPairGenerator g = KeyPairGenerator.getInstance("EC");
        g.initialize(new ECGenParameterSpec("secp256r1"));
        return g.generateKeyPair();
    }

    private static X509v3CertificateBuilder builder(X500Name issuer, X500Name subject, KeyPair keys) {
        // Certificate validity is wall time by nature (checked by OpenSSL and the JDK); an hour back
        // covers clock skew between this JVM and the broker.
        Instant now = Instant.now();
        return new JcaX509v3CertificateBuilder(issuer, BigInteger.valueOf(SERIAL.getAndIncrement()),
                Date.from(now.minus(Duration.ofHours(1))), Date.from(now.plus(Duration.ofDays(1))), subject,
                keys.getPublic());
    }

    private static X509Certificate sign(X509v3CertificateBuilder b, KeyPair signer) throws Exception {
        ContentSigner cs = new JcaContentSignerBuilder("SHA256withECDSA").build(signer.getPrivate());
        return new JcaX509CertificateConverter().getCertificate(b.build(cs));
    }
}
