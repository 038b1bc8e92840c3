package org.loopstand.plant.runtime;

import java.util.Locale;

/** How the plant's publisher thread lets a physics step's unit telemetry leave. */
public enum TelemetryPacing {
    /** all of a step's due telemetry at once, one message after the other (the loop's pattern) */
    BURST,
    /** evenly over the step's wall period, one slot per message ({@link TelemetrySpread}) */
    SPREAD;

    public String cliName() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** @throws IllegalArgumentException naming {@code option} and the values it takes */
    public static TelemetryPacing parse(String text, String option) {
        for (TelemetryPacing p : values()) {
            if (p.cliName().equals(text)) {
                return p;
            }
        }
        throw new IllegalArgumentException(option + " must be burst or spread, got " + text);
    }
}
