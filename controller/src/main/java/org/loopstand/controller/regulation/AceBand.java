package org.loopstand.controller.regulation;

/** Where the filtered ACE lies. */
public enum AceBand {
    /** |ACE| &lt; quiet band: no regulation request, no pulses. */
    QUIET,
    /** normal PI regulation by participation factors. */
    REGULATING,
    /** |ACE| &gt; assist limit: every available unit moves at its full rate. */
    ASSIST;

    /** Lower-case code for status messages. */
    public String code() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
