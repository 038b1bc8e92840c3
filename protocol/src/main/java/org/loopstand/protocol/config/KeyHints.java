package org.loopstand.protocol.config;

import java.util.Collection;
import java.util.Locale;

/** Finds the key a mistyped key most likely meant, for the "did you mean" part of a refusal. */
public final class KeyHints {
    private KeyHints() {
    }

    /** @return the candidate a mistyped {@code key} most likely meant, or null when none is close */
    public static String closest(String key, Collection<String> candidates) {
        String lower = key.toLowerCase(Locale.ROOT);
        for (String k : candidates) {
            // the usual slip: the unit suffix left off ("droop" for "droopPct")
            if (k.toLowerCase(Locale.ROOT).startsWith(lower)) {
                return k;
            }
        }
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String k : candidates) {
            int d = distance(lower, k.toLowerCase(Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = k;
            }
        }
        return bestDistance <= Math.max(2, key.length() / 3) ? best : null;
    }

    /** @return " (did you mean 'x'?)" or "" when no candidate is close */
    public static String didYouMean(String key, Collection<String> candidates) {
        String hint = closest(key, candidates);
        return hint != null ? " (did you mean '" + hint + "'?)" : "";
    }

    private static int distance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                cur[j] = Math.min(Math.min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + cost);
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }
}
