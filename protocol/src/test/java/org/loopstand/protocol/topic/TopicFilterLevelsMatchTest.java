package org.loopstand.protocol.topic;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The level walk of {@link TopicFilter#levelsMatch} against the split-based matching it replaced,
 * over every filter and topic built from a few levels. The rules themselves (OASIS MQTT Version 5.0,
 * section 4.7 Topic Names and Topic Filters) are checked case by case in {@link TopicFilterTest}.
 */
class TopicFilterLevelsMatchTest {
    /** Whole levels, wildcards, the empty level and a $ level: the cases 4.7 singles out (from memory). */
    private static final List<String> FILTER_LEVELS = List.of("", "a", "b", "ab", "+", "#", "$SYS");
    private static final List<String> TOPIC_LEVELS = List.of("", "a", "b", "ab", "$SYS");

    @Test
    void shouldMatchExactlyAsTheSplitMatchingDidOverEveryShortFilterAndTopic() {
        List<String> filters = joinedUpTo(FILTER_LEVELS, 4);
        List<String> topics = joinedUpTo(TOPIC_LEVELS, 4);
        int matched = 0;
        for (String filter : filters) {
            for (String topic : topics) {
                boolean expected = splitMatches(filter, topic);
                if (TopicFilter.levelsMatch(filter, topic) != expected) {
                    throw new AssertionError("'" + filter + "' vs '" + topic + "': split matching says " + expected);
                }
                matched += expected ? 1 : 0;
            }
        }
        assertThat(filters).hasSize(7 + 49 + 343 + 2401);
        assertThat(topics).hasSize(5 + 25 + 125 + 625);
        // Both outcomes occur often: the comparison is not between two constant answers.
        assertThat(matched).isBetween(10_000, filters.size() * topics.size() - 10_000);
    }

    @Test
    void shouldMatchTheSection47ExamplesWithoutValidatingAgain() {
        // OASIS MQTT Version 5.0, 4.7.1.2, 4.7.1.3 and 4.7.2 (from memory)
        assertThat(TopicFilter.levelsMatch("sport/tennis/player1/#", "sport/tennis/player1")).isTrue();
        assertThat(TopicFilter.levelsMatch("sport/#", "sport")).isTrue();
        assertThat(TopicFilter.levelsMatch("sport/+", "sport")).isFalse();
        assertThat(TopicFilter.levelsMatch("sport/+", "sport/")).isTrue();
        assertThat(TopicFilter.levelsMatch("+/+", "/finance")).isTrue();
        assertThat(TopicFilter.levelsMatch("+", "/finance")).isFalse();
        assertThat(TopicFilter.levelsMatch("#", "$SYS/broker")).isFalse();
        assertThat(TopicFilter.levelsMatch("$SYS/#", "$SYS/broker")).isTrue();
        assertThat(TopicFilter.levelsMatch("sport/tennis", "sport/tennis/")).isFalse();
        assertThat(TopicFilter.levelsMatch("loopstand/v1/s/area/+/meter/+", "loopstand/v1/s/area/north/meter/m1")).isTrue();
        assertThat(TopicFilter.levelsMatch("loopstand/v1/s/area/+/meter/+", "loopstand/v1/s/area/north/meter")).isFalse();
    }

    private static List<String> joinedUpTo(List<String> levels, int maxLevels) {
        List<String> out = new ArrayList<>();
        List<String> previous = List.of("");
        for (int n = 1; n <= maxLevels; n++) {
            List<String> next = new ArrayList<>();
            for (String prefix : previous) {
                for (String level : levels) {
                    next.add(n == 1 ? level : prefix + "/" + level);
                }
            }
            out.addAll(next);
            previous = next;
        }
        return out;
    }

    /** The matching as it was before the level walk, kept as the reference. */
    private static boolean splitMatches(String filter, String topic) {
        if (topic.startsWith("$") && (filter.startsWith("+") || filter.startsWith("#"))) {
            return false;
        }
        String[] f = filter.split("/", -1);
        String[] t = topic.split("/", -1);
        for (int i = 0; i < f.length; i++) {
            if (f[i].equals("#")) {
                return true;
            }
            if (i >= t.length) {
                return false;
            }
            if (!f[i].equals("+") && !f[i].equals(t[i])) {
                return false;
            }
        }
        return f.length == t.length;
    }
}
