package org.loopstand.controller.config;

/**
 * @param aceSanityLimitMw      |ACE| above this is treated as a measurement problem, not a real
 *                              imbalance: suspend, MW &gt; 0 (default 2000)
 * @param resumeAfterClearCycles consecutive clear cycles before regulation resumes, ≥ 1 (default 3)
 */
public record InterlockSettings(double aceSanityLimitMw, int resumeAfterClearCycles) {
    public static final InterlockSettings DEFAULTS = new InterlockSettings(2000, 3);

    public InterlockSettings {
        if (!(aceSanityLimitMw > 0) || !Double.isFinite(aceSanityLimitMw)) {
            throw new IllegalArgumentException("aceSanityLimitMw must be > 0, was " + aceSanityLimitMw);
        }
        if (resumeAfterClearCycles < 1) {
            throw new IllegalArgumentException("resumeAfterClearCycles must be >= 1, was " + resumeAfterClearCycles);
        }
    }
}
