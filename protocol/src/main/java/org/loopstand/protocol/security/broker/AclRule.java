package org.loopstand.protocol.security.broker;

import java.util.Objects;

import org.loopstand.protocol.topic.TopicFilter;

/**
 * One permission: an access on an MQTT topic filter ({@code +} and {@code #} wildcards).
 *
 * @param access      read, write or both
 * @param topicFilter topic filter built with {@code TopicTree}
 */
public record AclRule(Access access, String topicFilter) {
    public AclRule {
        Objects.requireNonNull(access, "access");
        Objects.requireNonNull(topicFilter, "topicFilter");
    }

    /**
     * @return whether a concrete topic falls under this rule's filter: the same MQTT matching as a
     *         subscription ({@link TopicFilter#levelsMatch}: {@code +} one level, {@code #} the rest including
     *         the parent level, a {@code $} topic never under a leading wildcard)
     */
    public boolean matchesTopic(String topic) {
        return TopicFilter.levelsMatch(topicFilter, topic);
    }

    /**
     * @return whether every topic a subscriber to {@code filter} could receive is covered by this
     *         rule (a subscription to a wider filter than allowed is refused as a whole)
     */
    public boolean coversFilter(String filter) {
        String[] f = topicFilter.split("/", -1);
        String[] s = filter.split("/", -1);
        for (int i = 0; i < f.length; i++) {
            if (f[i].equals("#")) {
                return true;
            }
            if (i >= s.length || s[i].equals("#")) {
                return false;
            }
            if (f[i].equals("+")) {
                continue;
            }
            if (!f[i].equals(s[i])) {
                return false;
            }
        }
        return f.length == s.length;
    }
}
