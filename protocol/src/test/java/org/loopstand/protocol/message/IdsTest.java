package org.loopstand.protocol.message;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** The hand-written id check against {@link Ids#PATTERN}, the rule it replaced on the hot path. */
class IdsTest {
    @Test
    void shouldAcceptExactlyWhatThePatternAcceptsForEveryCharacterInEveryPosition() {
        List<String> candidates = new ArrayList<>();
        for (int c = 0; c <= Character.MAX_VALUE; c++) {
            String ch = String.valueOf((char) c);
            candidates.add(ch);              // first position
            candidates.add("a" + ch);        // later position
            candidates.add("a" + ch + "b");
        }
        int accepted = assertSameAsPattern(candidates);
        // 62 letters and digits alone, 64 characters after "a" twice over.
        assertThat(accepted).isEqualTo(62 + 64 + 64);
    }

    @Test
    void shouldAcceptExactlyWhatThePatternAcceptsAtTheLengthLimitsAndOnRandomTexts() {
        List<String> candidates = new ArrayList<>(List.of("", "-a", "_a", "a-", "a_", "A9_-z", "a\n", "\na",
                "é", "a٣", "Ａ", "ß", "a\uD83D\uDE00", "unit 1", "unit/1", "unit+1", "unit#1"));
        candidates.add(null);
        for (int length = 60; length <= 66; length++) {
            candidates.add("u".repeat(length));
            candidates.add("-".repeat(length));
        }
        Random random = new Random(20261203L);
        String alphabet = "aZ09_-. /+#é\u0000\u00a0٣Ａ";
        for (int i = 0; i < 50_000; i++) {
            int length = random.nextInt(70);
            StringBuilder id = new StringBuilder(length);
            for (int k = 0; k < length; k++) {
                id.append(alphabet.charAt(random.nextInt(alphabet.length())));
            }
            candidates.add(id.toString());
        }
        int accepted = assertSameAsPattern(candidates);
        assertThat(accepted).isGreaterThan(10);
    }

    private static int assertSameAsPattern(List<String> candidates) {
        int accepted = 0;
        for (String id : candidates) {
            boolean expected = id != null && Ids.PATTERN.matcher(id).matches();
            if (Ids.isValid(id) != expected) {
                throw new AssertionError("'" + id + "': the pattern says " + expected);
            }
            accepted += expected ? 1 : 0;
        }
        return accepted;
    }
}
