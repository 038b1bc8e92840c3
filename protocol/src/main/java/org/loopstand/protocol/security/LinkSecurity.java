package org.loopstand.protocol.security;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import org.loopstand.protocol.bus.mqtt.BrokerEndpoints;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;

/**
 * The security a process runs with, resolved from its {@link AuthOptions}: broker credentials (one
 * identity, or a users file for a process holding several), TLS stores, command keys, and whether it
 * runs insecure. Passwords live in char arrays read from files and never appear in
 * {@link #toString()} or messages.
 *
 * <p>Default demo: a process given no security option at all, whose broker is a loopback
 * {@code tcp://} URL, runs insecure exactly as with {@code --insecure} (banner included), so that the
 * default rehearsal on the embedded broker needs no key setup. Giving any security option switches
 * that off: then everything needed must be there or the process refuses to start.
 */
public final class LinkSecurity {
    private final boolean insecure;
    private final boolean implicit;
    private final String username;
    private final char[] password;
    private final Map<String, char[]> credentials;
    private final Path trustStore;
    private final char[] trustStorePassword;
    private final Path keyStore;
    private final char[] keyStorePassword;
    private final KeyRing keys;
    private final Path credentialsFile;
    private final AuthPolicy.Decision decision;

    private LinkSecurity(boolean insecure, boolean implicit, String username, char[] password,
            Map<String, char[]> credentials, Path credentialsFile, Path trustStore, char[] trustStorePassword,
            Path keyStore, char[] keyStorePassword, KeyRing keys, AuthPolicy.Decision decision) {
        this.insecure = insecure;
        this.implicit = implicit;
        this.username = username;
        this.password = password;
        this.credentials = credentials;
        this.credentialsFile = credentialsFile;
        this.trustStore = trustStore;
        this.trustStorePassword = trustStorePassword;
        this.keyStore = keyStore;
        this.keyStorePassword = keyStorePassword;
        this.keys = keys;
        this.decision = decision;
    }

    /** @return insecure settings for a loopback broker (tests and in-process demos) */
    public static LinkSecurity insecureLoopback() {
        return new LinkSecurity(true, false, null, null, Map.of(), null, null, null, null, null, null,
                new AuthPolicy.Decision(true, true, List.of("no broker auth, no TLS, unsigned commands accepted")));
    }

    static LinkSecurity resolve(AuthOptions o, String brokerUri, Map<String, String> env) throws SecuritySetupException {
        boolean implicit = !o.anyGiven() && isPlainLoopback(brokerUri);
        boolean insecure = o.insecure || implicit;
        try {
            if (o.passwordFile != null && o.username == null) {
                throw new SecuritySetupException("--password-file needs --username");
            }
            if (o.username != null && o.passwordFile == null && o.credentialsFile == null) {
                throw new SecuritySetupException("--username " + o.username + " needs --password-file (passwords are never"
                        + " taken on the command line)");
            }
            if (o.trustStorePasswordFile != null && o.trustStore == null || o.keyStorePasswordFile != null && o.keyStore == null) {
                throw new SecuritySetupException("a store password file was given without its --trust-store/--key-store");
            }
            char[] password = o.passwordFile == null ? null : readSecret(o.passwordFile, "--password-file");
            Map<String, char[]> credentials = o.credentialsFile == null ? Map.of() : readUsersFile(o.credentialsFile);
            if (password == null && o.username != null && !credentials.containsKey(o.username)) {
                throw new SecuritySetupException("--credentials-file " + o.credentialsFile + " has no line for --username "
                        + o.username);
            }
            KeyRing keys = o.keysFile != null ? KeyRing.load(o.keysFile) : implicit ? null
                    : KeyRing.fromEnvironment(env).orElse(null);
            boolean hasCredentials = password != null || !credentials.isEmpty();
            AuthPolicy.Decision d = AuthPolicy.decide(new AuthPolicy.Settings(brokerUri, insecure, hasCredentials, keys != null));
            if (!d.allowed()) {
                throw new SecuritySetupException(d.message());
            }
            return new LinkSecurity(insecure, implicit, o.username, password, credentials, o.credentialsFile, o.trustStore,
                    o.trustStorePasswordFile == null ? null : readSecret(o.trustStorePasswordFile, "--trust-store-password-file"),
                    o.keyStore, o.keyStorePasswordFile == null ? null : readSecret(o.keyStorePasswordFile, "--key-store-password-file"),
                    keys, d);
        } catch (IOException e) {
            throw new SecuritySetupException("cannot read a security file: " + e.getMessage());
        } catch (IllegalArgumentException e) {
            throw new SecuritySetupException(e.getMessage());
        }
    }

    /** @return true when every node of the broker list is a tcp:// loopback address */
    private static boolean isPlainLoopback(String brokerUri) {
        return AuthPolicy.isLoopbackBroker(brokerUri) && !BrokerEndpoints.parse(brokerUri).isTls();
    }

    /** @return the first line of the file, which must not be empty (the value is never echoed) */
    static char[] readSecret(Path file, String option) throws IOException, SecuritySetupException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        String first = lines.isEmpty() ? "" : lines.get(0).strip();
        if (first.isEmpty()) {
            throw new SecuritySetupException(option + " " + file + ": the first line is empty");
        }
        return first.toCharArray();
    }

    /**
     * Reads a users file ({@code username = password} a line, {@code #} comments), the same format as
     * {@code config/broker/users.example.properties}.
     *
     * @return username → password, in file order
     */
    public static Map<String, char[]> readUsersFile(Path file) throws IOException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        Map<String, char[]> users = new LinkedHashMap<>();
        for (int i = 0; i < lines.size(); i++) {
            String line = lines.get(i).strip();
            if (line.isEmpty() || line.startsWith("#")) {
                continue;
            }
            int eq = line.indexOf('=');
            String where = file + " line " + (i + 1);
            if (eq < 1) {
                throw new IllegalArgumentException(where + ": expected 'username = password'");
            }
            String user = line.substring(0, eq).strip();
            String pw = line.substring(eq + 1).strip();
            if (pw.isEmpty() || pw.contains("CHANGE-ME")) {
                throw new IllegalArgumentException(where + ": the password of " + user + " is empty or a placeholder");
            }
            if (users.put(user, pw.toCharArray()) != null) {
                throw new IllegalArgumentException(where + ": duplicate user " + user);
            }
        }
        return users;
    }

    /** @return whether the process runs without broker auth, TLS and command signing */
    public boolean insecure() {
        return insecure;
    }

    /** @return whether commands are signed (controller) and required to be signed (plant) */
    public boolean signsCommands() {
        return !insecure;
    }

    /** @return the command keys, when given (also in insecure mode: the controller then still signs) */
    public Optional<KeyRing> keys() {
        return Optional.ofNullable(keys);
    }

    /** @return the users file given with --credentials-file, if any */
    public Optional<Path> credentialsFile() {
        return Optional.ofNullable(credentialsFile);
    }

    /** @return the --username, if any */
    public Optional<String> username() {
        return Optional.ofNullable(username);
    }

    /** @return whether a password is known for that identity */
    public boolean hasPasswordFor(String identity) {
        return identity.equals(username) && password != null || credentials.containsKey(identity);
    }

    /**
     * Adds credentials and TLS stores to a link configuration.
     *
     * @param identity the broker username to log in as, or null for --username
     * @throws IllegalArgumentException when credentials are in force but none is known for the identity
     */
    public MqttLinkConfig.Builder applyTo(MqttLinkConfig.Builder b, String identity) {
        String user = identity == null ? username : identity;
        char[] pw = user == null ? null : user.equals(username) && password != null ? password : credentials.get(user);
        if (user != null && pw != null) {
            b.credentials(user, pw);
        } else if (!insecure) {
            throw new IllegalArgumentException("no broker password for identity " + user + " (add it to --credentials-file"
                    + " or give --username/--password-file)");
        }
        if (trustStore != null) {
            b.trustStore(trustStore, trustStorePassword);
        }
        if (keyStore != null) {
            b.keyStore(keyStore, keyStorePassword);
        }
        return b;
    }

    /** @return what to print at start: the insecure banner, or one line naming what is in force */
    public String startMessage() {
        if (insecure) {
            return (implicit ? "security: no security option given and the broker is on loopback: running as --insecure"
                    + System.lineSeparator() : "") + AuthPolicy.INSECURE_BANNER;
        }
        return String.format(Locale.ROOT, "security: broker auth%s, TLS %s, command signing with %s",
                username != null ? " as " + username : credentials.isEmpty() ? "" : " from " + credentialsFile,
                trustStore != null || keyStore != null ? "stores given" : "off (loopback)", keys);
    }

    /** @return the policy decision this was resolved with */
    public AuthPolicy.Decision decision() {
        return decision;
    }

    @Override
    public String toString() {
        return "LinkSecurity[insecure=" + insecure + ", username=" + username + ", identities=" + credentials.keySet()
                + ", trustStore=" + trustStore + ", keyStore=" + keyStore + ", keys=" + keys + "]";
    }
}
