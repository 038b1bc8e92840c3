package org.loopstand.protocol.config;

import java.util.Map;
import java.util.Set;

/**
 * Where one mapping of a configuration file and each of its keys are written, kept beside the typed
 * values read from it, so that a check made later (by whoever uses the values) can still point at the
 * line, in the same form as {@link MappingReader}'s own messages.
 *
 * @param what   how the mapping is named in messages, e.g. "unit g1"
 * @param at     where the mapping starts
 * @param keys   where each written key is
 * @param failed keys already refused by the reader (a later check on them would only repeat it)
 */
public record KeyLocations(String what, SourceLocation at, Map<String, SourceLocation> keys, Set<String> failed) {
    public KeyLocations {
        keys = Map.copyOf(keys);
        failed = Set.copyOf(failed);
    }

    /** @return where {@code key} is written, or the mapping's own place when it is not */
    public SourceLocation of(String key) {
        return keys.getOrDefault(key, at);
    }

    public boolean has(String key) {
        return keys.containsKey(key);
    }

    /** @return true when the reader already refused {@code key} */
    public boolean failed(String key) {
        return failed.contains(key);
    }

    /** @return {@code file:line:column: KEY of WHAT MESSAGE}, at the key */
    public String problem(String key, String message) {
        return of(key) + ": " + key + " of " + what + " " + message;
    }

    /** @return {@code file:line:column: WHAT is missing 'KEY'}, at the mapping */
    public String missing(String key) {
        return at + ": " + what + " is missing '" + key + "'";
    }

    /** @return {@code file:line:column: WHAT MESSAGE}, at the mapping */
    public String problem(String message) {
        return at + ": " + what + " " + message;
    }
}
