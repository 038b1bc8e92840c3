package org.loopstand.controller.config;

/** What an input gives when its own latest value is not usable. */
public enum FallbackPolicy {
    /** the last good value, for at most the hold time past its age limit */
    HOLD_LAST_GOOD,
    /** the value of the second (alternate) source, if that one is usable */
    ALTERNATE_SOURCE,
    /** nothing: the input is unusable at once */
    DECLARE_UNUSABLE
}
