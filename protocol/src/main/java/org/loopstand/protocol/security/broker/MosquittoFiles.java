package org.loopstand.protocol.security.broker;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.security.GeneralSecurityException;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.Base64;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.crypto.SecretKeyFactory;
import javax.crypto.spec.PBEKeySpec;

/**
 * Writes the files a Mosquitto 2 broker needs from a {@link BrokerAccessModel}: the ACL file, the
 * password file and the configuration from the shipped template.
 *
 * <p>Password hashes are made here in Java, in Mosquitto 2's PBKDF2 format
 * {@code $7$<iterations>$<base64 salt>$<base64 hash>} (PBKDF2-HMAC-SHA512, 12-byte salt, 64-byte
 * hash; from memory of mosquitto's password_mosq.c, and checked by a test against a real
 * mosquitto), so no {@code mosquitto_passwd} is needed on the machine that generates them.
 */
public final class MosquittoFiles {
    /** PBKDF2 iterations: mosquitto_passwd's default (from memory). */
    public static final int PBKDF2_ITERATIONS = 101;
    /** Shortest broker password accepted. */
    public static final int MIN_PASSWORD_CHARS = 16;

    private static final int SALT_BYTES = 12;
    private static final int HASH_BYTES = 64;
    private static final Pattern PLACEHOLDER = Pattern.compile("\\$\\{([A-Z_]+)}");
    private static final SecureRandom RANDOM = new SecureRandom();

    private MosquittoFiles() {
    }

    /** @return a password file line's hash part for that password (fresh random salt) */
    public static String hashPassword(String password) {
        byte[] salt = new byte[SALT_BYTES];
        RANDOM.nextBytes(salt);
        return hashPassword(password, salt, PBKDF2_ITERATIONS);
    }

    static String hashPassword(String password, byte[] salt, int iterations) {
        try {
            PBEKeySpec spec = new PBEKeySpec(password.toCharArray(), salt, iterations, HASH_BYTES * 8);
            byte[] hash = SecretKeyFactory.getInstance("PBKDF2WithHmacSHA512").generateSecret(spec).getEncoded();
            spec.clearPassword();
            Base64.Encoder b64 = Base64.getEncoder();
            return "$7$" + iterations + "$" + b64.encodeToString(salt) + "$" + b64.encodeToString(hash);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException("PBKDF2WithHmacSHA512 is not available in this JVM", e);
        }
    }

    /**
     * Reads a users file: {@code username = password} a line, {@code #} comments. Every identity of
     * the model must have a password and no unknown user may appear.
     *
     * @return username → password, in the model's order
     */
    public static Map<String, String> loadPasswords(Path file, BrokerAccessModel model) throws IOException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        Map<String, String> given = new LinkedHashMap<>();
        for (int i = 0; i < lines.size(); i++) {
            String line = lines.get(i).strip();
            if (line.isEmpty() || line.startsWith("#")) {
                continue;
            }
            int eq = line.indexOf('=');
            String where = file + " line " + (i + 1);
            if (eq < 0) {
                throw new IllegalArgumentException(where + ": expected 'username = password'");
            }
            String user = line.substring(0, eq).strip();
            if (given.put(user, line.substring(eq + 1).strip()) != null) {
                throw new IllegalArgumentException(where + ": duplicate user " + user);
            }
        }
        return checkPasswords(given, model, file.toString());
    }

    /** @return the passwords in the model's order after checking them (see {@link #loadPasswords}) */
    public static Map<String, String> checkPasswords(Map<String, String> given, BrokerAccessModel model,
            String source) {
        List<String> problems = new ArrayList<>();
        Map<String, String> ordered = new LinkedHashMap<>();
        for (BrokerIdentity id : model.identities()) {
            String pw = given.get(id.username());
            if (pw == null) {
                problems.add("no password for " + id.username());
            } else if (pw.length() < MIN_PASSWORD_CHARS || pw.contains("CHANGE-ME")) {
                // Never echo the password itself.
                problems.add("password of " + id.username() + " is a placeholder or shorter than "
                        + MIN_PASSWORD_CHARS + " characters");
            } else {
                ordered.put(id.username(), pw);
            }
        }
        for (String user : given.keySet()) {
            if (model.identity(user).isEmpty()) {
                problems.add("user " + user + " is not an identity of site " + model.site());
            }
        }
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException(source + ": " + String.join("; ", problems));
        }
        return ordered;
    }

    /** Writes {@code username:$7$...} lines, owner-readable only where the file system allows. */
    public static void writePasswordFile(Map<String, String> passwords, Path file) throws IOException {
        StringBuilder b = new StringBuilder();
        passwords.forEach((user, pw) -> b.append(user).append(':').append(hashPassword(pw)).append('\n'));
        writePrivate(file, b.toString());
    }

    /** Writes the model's ACL file. */
    public static void writeAclFile(BrokerAccessModel model, Path file) throws IOException {
        Files.writeString(file, model.toMosquittoAcl(), StandardCharsets.UTF_8);
    }

    /**
     * @param template text with {@code ${NAME}} placeholders (config/broker/mosquitto-secure.conf)
     * @param values   NAME → value
     * @return the configuration; refuses a placeholder without value
     */
    public static String renderTemplate(String template, Map<String, String> values) {
        Matcher m = PLACEHOLDER.matcher(template);
        StringBuilder out = new StringBuilder();
        List<String> missing = new ArrayList<>();
        while (m.find()) {
            String v = values.get(m.group(1));
            if (v == null) {
                missing.add(m.group(1));
                v = m.group();
            }
            m.appendReplacement(out, Matcher.quoteReplacement(v));
        }
        m.appendTail(out);
        if (!missing.isEmpty()) {
            throw new IllegalArgumentException("broker config template: no value for " + missing);
        }
        return out.toString();
    }

    private static void writePrivate(Path file, String text) throws IOException {
        Files.writeString(file, text, StandardCharsets.UTF_8);
        try {
            Files.setPosixFilePermissions(file, PosixFilePermissions.fromString("rw-------"));
        } catch (UnsupportedOperationException e) {
            // Not a POSIX file system: permissions are left to the operator (docs/security.md).
        }
    }
}
