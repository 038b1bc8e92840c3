package org.loopstand.bench.probe;

/** Reads the top-level {@code "seq":N} of a JSON payload without decoding it (for keying stamps). */
public final class SeqPeek {
    private static final byte[] KEY = {'"', 's', 'e', 'q', '"'};

    private SeqPeek() {
    }

    /** @return the first {@code "seq"} number in the payload, or -1 when there is none */
    public static long seq(byte[] json) {
        outer:
        for (int i = 0; i + KEY.length < json.length; i++) {
            for (int k = 0; k < KEY.length; k++) {
                if (json[i + k] != KEY[k]) {
                    continue outer;
                }
            }
            int j = i + KEY.length;
            while (j < json.length && (json[j] == ' ' || json[j] == ':')) {
                j++;
            }
            long v = 0;
            int start = j;
            while (j < json.length && json[j] >= '0' && json[j] <= '9') {
                v = v * 10 + (json[j++] - '0');
            }
            return j > start ? v : -1;
        }
        return -1;
    }
}
