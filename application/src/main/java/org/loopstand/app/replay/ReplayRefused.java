package org.loopstand.app.replay;

/** A run folder or journal that cannot be replayed; the message names the file and, where there is one, the line. */
public final class ReplayRefused extends Exception {
    public ReplayRefused(String message) {
        super(message);
    }
}
