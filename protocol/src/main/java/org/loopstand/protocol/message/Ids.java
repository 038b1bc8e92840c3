package org.loopstand.protocol.message;

import java.util.regex.Pattern;

/** The id rule of the wire contract, shared by topics and message fields. */
public final class Ids {
    /** Ids of sites, areas, ties, units, meters, controllers: 1 to 64 characters. */
    public static final Pattern PATTERN = Pattern.compile("[A-Za-z0-9][A-Za-z0-9_-]{0,63}");

    private Ids() {
    }

    /** Longest id, characters ({@link #PATTERN}'s 1 + 63). */
    static final int MAX_LENGTH = 64;

    /**
     * Accepts exactly what {@link #PATTERN} matches, checked character by character: ids are
     * checked on every topic and message field, and the regular expression was a measurable part
     * of a lockstep run.
     *
     * @return whether the text is a valid id (false for null)
     */
    public static boolean isValid(String id) {
        if (id == null || id.isEmpty() || id.length() > MAX_LENGTH || !isAsciiLetterOrDigit(id.charAt(0))) {
            return false;
        }
        for (int i = 1; i < id.length(); i++) {
            char c = id.charAt(i);
            if (!isAsciiLetterOrDigit(c) && c != '_' && c != '-') {
                return false;
            }
        }
        return true;
    }

    private static boolean isAsciiLetterOrDigit(char c) {
        return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9');
    }

    /**
     * @param what name of the id, e.g. "unit"
     * @param id   the value
     * @return the id
     * @throws IllegalArgumentException naming the id when it does not match {@link #PATTERN}
     */
    public static String requireValid(String what, String id) {
        if (!isValid(id)) {
            throw new IllegalArgumentException(
                    what + " id " + (id == null ? "null" : "'" + id + "'") + " does not match " + PATTERN.pattern());
        }
        return id;
    }
}
