package org.loopstand.controller.pulsetest.safety;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.nio.charset.StandardCharsets;

/**
 * Aborts when {@code q} (or {@code Q}) arrives on the console. Polls without blocking: only what
 * {@link Reader#ready()} promises is read. A closed or failing input does not abort on its own.
 *
 * <p>Give it the same reader the confirmation prompt read from: a buffered reader takes everything
 * typed so far into its own buffer, so a second reader on the raw stream would never see a {@code q}
 * typed before the programme started.
 */
public final class KeyAbortSwitch implements AbortSwitch {
    private final Reader in;
    private volatile boolean pressed;

    /** @param in the console, shared with any prompt that read from it before */
    public KeyAbortSwitch(Reader in) {
        this.in = in;
    }

    /** Reads the stream as UTF-8 text (nothing else may read from it). */
    public KeyAbortSwitch(InputStream in) {
        this(new InputStreamReader(in, StandardCharsets.UTF_8));
    }

    @Override
    public boolean abortRequested() {
        if (pressed) {
            return true;
        }
        try {
            // bounded: at most what was typed since the last poll, and never more than 4096 characters
            for (int i = 0; i < 4096 && in.ready(); i++) {
                int c = in.read();
                if (c < 0) {
                    break;
                }
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
