package org.loopstand.protocol.topic;

/**
 * MQTT 5 topic filter matching (OASIS MQTT Version 5.0, section 4.7), for the in-memory bus.
 *
 * <p>{@code +} matches exactly one level (which may be empty), {@code #} matches its parent level
 * and any number of levels below it and must be the last level. Topics starting with {@code $}
 * are not matched by a filter starting with a wildcard. A shared subscription
 * {@code $share/{group}/{filter}} matches like its filter.
 */
public final class TopicFilter {
    private static final String SHARE_PREFIX = "$share/";

    private TopicFilter() {
    }

    /**
     * @param filter subscription filter, possibly with wildcards or a {@code $share/group/} prefix
     * @param topic  concrete topic name (no wildcards)
     * @return whether a subscription with the filter receives messages published on the topic
     * @throws IllegalArgumentException if the filter or topic is not valid by the MQTT rules
     */
    public static boolean matches(String filter, String topic) {
        String plainFilter = stripShare(filter);
        validateFilter(plainFilter);
        validateTopic(topic);
        return levelsMatch(plainFilter, topic);
    }

    /**
     * The matching rule alone, for callers that validated filter and topic when they were
     * subscribed or published (the in-memory broker matches every publish against every
     * subscription). Walks both strings level by level without splitting them: no allocation.
     *
     * @param filter a valid filter without share prefix
     * @param topic  a valid concrete topic name
     * @return whether the filter matches the topic
     */
    public static boolean levelsMatch(String filter, String topic) {
        if (topic.startsWith("$") && (filter.startsWith("+") || filter.startsWith("#"))) {
            return false;
        }
        int filterStart = 0;
        int topicStart = 0;
        boolean topicUsedUp = false;
        while (true) {
            int filterEnd = levelEnd(filter, filterStart);
            int filterLevelLength = filterEnd - filterStart;
            if (filterLevelLength == 1 && filter.charAt(filterStart) == '#') {
                return true; // also matches the parent level alone: "a/#" matches "a"
            }
            if (topicUsedUp) {
                return false;
            }
            int topicEnd = levelEnd(topic, topicStart);
            boolean plus = filterLevelLength == 1 && filter.charAt(filterStart) == '+';
            if (!plus && (filterLevelLength != topicEnd - topicStart
                    || !filter.regionMatches(filterStart, topic, topicStart, filterLevelLength))) {
                return false;
            }
            if (filterEnd == filter.length()) {
                return topicEnd == topic.length(); // as many levels on both sides
            }
            topicUsedUp = topicEnd == topic.length();
            topicStart = topicEnd + 1;
            filterStart = filterEnd + 1;
        }
    }

    private static int levelEnd(String text, int levelStart) {
        int slash = text.indexOf('/', levelStart);
        return slash < 0 ? text.length() : slash;
    }

    /**
     * @param filter a subscription filter
     * @return the filter without a {@code $share/{group}/} prefix
     * @throws IllegalArgumentException if a shared subscription lacks its group or filter
     */
    public static String stripShare(String filter) {
        if (filter == null) {
            throw new IllegalArgumentException("topic filter is null");
        }
        if (!filter.startsWith(SHARE_PREFIX)) {
            return filter;
        }
        int slash = filter.indexOf('/', SHARE_PREFIX.length());
        String group = slash < 0 ? "" : filter.substring(SHARE_PREFIX.length(), slash);
        if (group.isEmpty() || group.contains("+") || group.contains("#") || slash + 1 >= filter.length()) {
            throw new IllegalArgumentException(
                    "shared subscription must be $share/{group}/{filter} with a group free of wildcards: " + filter);
        }
        return filter.substring(slash + 1);
    }

    /**
     * @param filter a filter without share prefix
     * @throws IllegalArgumentException if empty, or a wildcard does not occupy a whole level, or
     *                                  {@code #} is not last
     */
    public static void validateFilter(String filter) {
        if (filter == null || filter.isEmpty()) {
            throw new IllegalArgumentException("topic filter must not be empty");
        }
        checkNoNul(filter);
        String[] levels = filter.split("/", -1);
        for (int i = 0; i < levels.length; i++) {
            String level = levels[i];
            if (level.contains("#") && (!level.equals("#") || i != levels.length - 1)) {
                throw new IllegalArgumentException("'#' must be a whole level and the last one: " + filter);
            }
            if (level.contains("+") && !level.equals("+")) {
                throw new IllegalArgumentException("'+' must occupy a whole level: " + filter);
            }
        }
    }

    /**
     * @param topic a concrete topic name
     * @throws IllegalArgumentException if empty or containing a wildcard
     */
    public static void validateTopic(String topic) {
        if (topic == null || topic.isEmpty()) {
            throw new IllegalArgumentException("topic name must not be empty");
        }
        checkNoNul(topic);
        if (topic.contains("+") || topic.contains("#")) {
            throw new IllegalArgumentException("topic name must not contain wildcards: " + topic);
        }
    }

    private static void checkNoNul(String text) {
        if (text.indexOf('\u0000') >= 0) {
            throw new IllegalArgumentException("topic must not contain U+0000");
        }
    }
}
