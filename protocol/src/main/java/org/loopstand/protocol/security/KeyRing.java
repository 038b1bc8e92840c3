package org.loopstand.protocol.security;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Base64;
import java.util.Collection;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;
import org.loopstand.protocol.message.Ids;

/**
 * The command keys of a site: per unit, key id → {@link UnitKey}. Immutable and thread-safe.
 *
 * <p>File format (UTF-8, one entry a line, {@code #} starts a comment):
 * <pre>
 * G1.k2025a = &lt;base64 of at least 32 random bytes&gt;
 * G1.k2025a.validUntil = 2025-07-01T00:00:00Z
 * G1.k2025b = &lt;base64&gt;
 * G1.k2025b.validFrom = 2025-06-24T00:00:00Z
 * </pre>
 * validFrom/validUntil take an ISO-8601 instant or epoch ms and are optional (open ends). Errors name
 * the file and line but never echo a key value. {@link #toString()} lists ids only.
 */
public final class KeyRing {
    /** Environment variable naming the keys file. */
    public static final String KEYS_FILE_ENV = "LOOPSTAND_KEYS_FILE";

    private final Map<String, Map<String, UnitKey>> keysByUnit;

    private KeyRing(Map<String, Map<String, UnitKey>> keysByUnit) {
        this.keysByUnit = keysByUnit;
    }

    /** @return a ring holding the given keys; duplicate unit.keyId pairs are refused */
    public static KeyRing of(Collection<UnitKey> keys) {
        Map<String, Map<String, UnitKey>> byUnit = new TreeMap<>();
        for (UnitKey key : keys) {
            UnitKey previous = byUnit.computeIfAbsent(key.unit(), u -> new TreeMap<>()).putIfAbsent(key.keyId(), key);
            if (previous != null) {
                throw new IllegalArgumentException("duplicate key " + key.unit() + "." + key.keyId());
            }
        }
        byUnit.replaceAll((u, m) -> Map.copyOf(m));
        return new KeyRing(Map.copyOf(byUnit));
    }

    /** @return the ring read from a keys file (format in the class comment) */
    public static KeyRing load(Path file) throws IOException {
        return parse(Files.readAllLines(file, StandardCharsets.UTF_8), file.toString());
    }

    /**
     * @param env the process environment (pass {@code System.getenv()})
     * @return the ring from the file named by {@value #KEYS_FILE_ENV}, or empty when it is not set
     */
    public static Optional<KeyRing> fromEnvironment(Map<String, String> env) throws IOException {
        String file = env.get(KEYS_FILE_ENV);
        if (file == null || file.isBlank()) {
            return Optional.empty();
        }
        return Optional.of(load(Path.of(file)));
    }

    /** @param source name used in error messages (file name) */
    static KeyRing parse(List<String> lines, String source) {
        Map<String, byte[]> secrets = new LinkedHashMap<>();
        Map<String, Long> from = new LinkedHashMap<>();
        Map<String, Long> until = new LinkedHashMap<>();
        for (int i = 0; i < lines.size(); i++) {
            String where = source + " line " + (i + 1);
            String line = lines.get(i).strip();
            if (line.isEmpty() || line.startsWith("#")) {
                continue;
            }
            int eq = line.indexOf('=');
            if (eq < 0) {
                throw new IllegalArgumentException(where + ": expected 'unit.keyId = base64'");
            }
            String name = line.substring(0, eq).strip();
            String value = line.substring(eq + 1).strip();
            String[] parts = name.split("\\.", -1);
            if (parts.length < 2 || parts.length > 3 || !Ids.isValid(parts[0]) || !Ids.isValid(parts[1])) {
                // The name is not echoed: a line missing its '=' may hold key material here.
                throw new IllegalArgumentException(where + ": expected 'unit.keyId = base64' or "
                        + "'unit.keyId.validFrom|validUntil = time' with ids matching " + Ids.PATTERN.pattern());
            }
            if (parts.length == 2) {
                String id = parts[0] + "." + parts[1];
                if (secrets.containsKey(id)) {
                    throw new IllegalArgumentException(where + ": duplicate key " + id);
                }
                try {
                    secrets.put(id, Base64.getDecoder().decode(value));
                } catch (IllegalArgumentException e) {
                    // The message deliberately leaves the value out.
                    throw new IllegalArgumentException(where + ": key " + id + " is not valid base64");
                }
            } else if (parts.length == 3 && (parts[2].equals("validFrom") || parts[2].equals("validUntil"))) {
                String id = parts[0] + "." + parts[1];
                Map<String, Long> target = parts[2].equals("validFrom") ? from : until;
                if (target.put(id, parseTime(value, where)) != null) {
                    throw new IllegalArgumentException(where + ": duplicate " + name);
                }
            } else {
                throw new IllegalArgumentException(where + ": '" + name
                        + "' is neither 'unit.keyId' nor 'unit.keyId.validFrom|validUntil'");
            }
        }
        for (String id : from.keySet()) {
            requireKey(secrets, id, "validFrom", source);
        }
        for (String id : until.keySet()) {
            requireKey(secrets, id, "validUntil", source);
        }
        List<UnitKey> keys = new ArrayList<>();
        for (Map.Entry<String, byte[]> e : secrets.entrySet()) {
            String[] parts = e.getKey().split("\\.");
            try {
                keys.add(new UnitKey(parts[0], parts[1], e.getValue(), from.getOrDefault(e.getKey(), Long.MIN_VALUE),
                        until.getOrDefault(e.getKey(), Long.MAX_VALUE)));
            } catch (IllegalArgumentException ex) {
                throw new IllegalArgumentException(source + ": " + ex.getMessage(), ex);
            }
        }
        return of(keys);
    }

    private static void requireKey(Map<String, byte[]> secrets, String id, String what, String source) {
        if (!secrets.containsKey(id)) {
            throw new IllegalArgumentException(source + ": " + id + "." + what + " given but key " + id + " is missing");
        }
    }

    private static long parseTime(String value, String where) {
        try {
            return value.chars().allMatch(Character::isDigit) && !value.isEmpty()
                    ? Long.parseLong(value)
                    : Instant.parse(value).toEpochMilli();
        } catch (NumberFormatException | DateTimeParseException e) {
            throw new IllegalArgumentException(where + ": '" + value + "' is neither an ISO-8601 instant nor epoch ms");
        }
    }

    /** @return the key of the unit with that id, whatever its validity window */
    public Optional<UnitKey> find(String unit, String keyId) {
        return Optional.ofNullable(keysByUnit.getOrDefault(unit, Map.of()).get(keyId));
    }

    /**
     * @return the key to sign with at that time: among the unit's keys valid then, the one with the
     *         latest validFrom (the newest during a rotation overlap); empty when none is valid
     */
    public Optional<UnitKey> signingKey(String unit, long epochMs) {
        return keysByUnit.getOrDefault(unit, Map.of()).values().stream()
                .filter(k -> k.isValidAt(epochMs))
                .max(Comparator.comparingLong(UnitKey::validFromMs).thenComparing(UnitKey::keyId));
    }

    /** @return whether the ring holds any key for the unit */
    public boolean hasUnit(String unit) {
        return keysByUnit.containsKey(unit);
    }

    /** @return the number of keys held */
    public int size() {
        return keysByUnit.values().stream().mapToInt(Map::size).sum();
    }

    /** @return unit and key ids only, never key material */
    @Override
    public String toString() {
        StringBuilder b = new StringBuilder("KeyRing[");
        keysByUnit.forEach((unit, keys) -> b.append(unit).append('=').append(new TreeMap<>(keys).keySet()).append(' '));
        return b.toString().strip() + "]";
    }
}
