package org.loopstand.protocol.message;

import java.util.regex.Pattern;

/** The id rule of the wire contract, shared by topics and message fields. */
public final class Ids {
    /** Ids of sites, areas, ties, units, meters, controllers: 1 to 64 characters. */
    public static final Pattern PATTERN = Pattern.compile("[A-Za-z0-9][A-Za-z0-9_-]{0,63}");

    private Ids() {
    }

    /** @return whether the text is a valid id (false for null) */
    public static boolean isValid(String id) {
        return id != null && PATTERN.matcher(id).matches();
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
