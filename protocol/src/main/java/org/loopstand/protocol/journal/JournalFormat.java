package org.loopstand.protocol.journal;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;

/** Names and constants of the run journal's JSON Lines format, shared by writer and reader. */
public final class JournalFormat {
    /** Value of the header's {@code journal} field. */
    public static final String MAGIC = "loopstand";
    /**
     * Schema version this code writes and the highest it reads (it reads every version from 1).
     * Version 2: the controller journal also holds every input it routed ({@code input} entries), the start
     * of its cycle schedule ({@code cycleClock}) and each cycle's monotonic start ({@code pollNs} in
     * {@code decided}), enough to replay it exactly; every version-1 entry is unchanged.
     */
    public static final int SCHEMA_VERSION = 2;
    /** The first schema version whose controller journal can be replayed. */
    public static final int FIRST_REPLAYABLE_VERSION = 2;

    /** Field holding the entry's scenario time, epoch ms. */
    public static final String FIELD_TIME = "t";
    /** Field holding the entry's kind. */
    public static final String FIELD_KIND = "kind";
    /** Kind of the closing entry written on a clean close. */
    public static final String KIND_END = "end";
    /** Field of the closing entry holding the {@link EndReason}. */
    public static final String FIELD_REASON = "reason";

    /** Usual entry kinds; any other name matching {@link #KIND_PATTERN} is accepted too. */
    public static final String KIND_RECEIVED = "received";
    public static final String KIND_SENT = "sent";
    public static final String KIND_DECIDED = "decided";
    public static final String KIND_REFUSED = "refused";
    public static final String KIND_TRUTH = "truth";
    public static final String KIND_EVENT = "event";
    public static final String KIND_FAULT = "fault";
    public static final String KIND_STATUS = "status";

    /** Allowed entry kind names: short lower camel case words. */
    public static final String KIND_PATTERN = "[a-z][A-Za-z0-9]{0,31}";

    private JournalFormat() {
    }

    /** @return a mapper configured the same way for writing and reading journals */
    static ObjectMapper newMapper() {
        ObjectMapper mapper = new ObjectMapper();
        mapper.disable(SerializationFeature.INDENT_OUTPUT);
        mapper.disable(SerializationFeature.FAIL_ON_EMPTY_BEANS);
        mapper.registerModule(StableOrderMaps.module()); // Map.of / Set.of in key order: the same bytes in every JVM
        return mapper;
    }
}
