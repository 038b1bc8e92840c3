package org.loopstand.protocol.journal;

/** Why a journal was closed cleanly; written in the closing {@code end} entry. */
public enum EndReason {
    /** The scenario ran to its planned end. */
    COMPLETED("completed"),
    /** The process was asked to stop (operator, signal handler, test) before the planned end. */
    STOPPED("stopped");

    private final String wireName;

    EndReason(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name written in the journal ({@code completed}, {@code stopped}) */
    public String wireName() {
        return wireName;
    }

    /**
     * @param wireName a name as written in a journal
     * @return the matching reason
     * @throws IllegalArgumentException naming the unknown value
     */
    public static EndReason fromWireName(String wireName) {
        for (EndReason r : values()) {
            if (r.wireName.equals(wireName)) {
                return r;
            }
        }
        throw new IllegalArgumentException("unknown journal end reason '" + wireName + "'");
    }
}
