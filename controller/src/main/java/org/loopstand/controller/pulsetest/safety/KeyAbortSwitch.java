package org.loopstand.controller.pulsetest.safety;

import java.io.IOException;
import java.io.InputStream;

/**
 * Aborts when {@code q} (or {@code Q}) arrives on an input stream. Polls without blocking: only what
 * {@link InputStream#available()} reports is read. A closed or failing input does not abort on its own.
 */
public final class KeyAbortSwitch implements AbortSwitch {
    private final InputStream in;
    private volatile boolean pressed;

    public KeyAbortSwitch(InputStream in) {
        this.in = in;
    }

    @Override
    public boolean abortRequested() {
        if (pressed) {
            return true;
        }
        try {
            int n = in.available();
            for (int i = 0; i < n; i++) {
                int c = in.read();
                if (c == 'q' || c == 'Q') {
                    pressed = true;
                    break;
                }
            }
        } catch (IOException e) {
            // An unreadable console cannot press the key; the telemetry watchdog still guards the run.
        }
        return pressed;
    }
}
