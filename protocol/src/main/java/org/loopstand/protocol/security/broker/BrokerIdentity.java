package org.loopstand.protocol.security.broker;

import java.util.List;
import java.util.Objects;

/**
 * A broker user and its permissions.
 *
 * @param username the MQTT username (also the identity name in docs and journal)
 * @param role     what the identity is, for docs and the ACL file comments
 * @param rules    what it may read and write; anything not listed is denied
 */
public record BrokerIdentity(String username, Role role, List<AclRule> rules) {
    /** The kinds of identity on a site. */
    public enum Role {
        CONTROLLER, UNIT, METER, PLANT, FAULT_TOOL
    }

    public BrokerIdentity {
        Objects.requireNonNull(username, "username");
        Objects.requireNonNull(role, "role");
        rules = List.copyOf(rules);
    }

    /** @return whether the identity may publish to that topic */
    public boolean mayPublish(String topic) {
        return rules.stream().anyMatch(r -> r.access().allowsPublish() && r.matchesTopic(topic));
    }

    /** @return whether the identity may subscribe to that filter (the filter must be wholly allowed) */
    public boolean maySubscribe(String filter) {
        return rules.stream().anyMatch(r -> r.access().allowsSubscribe() && r.coversFilter(filter));
    }

    /** @return whether the identity may receive a message published on that topic */
    public boolean mayReceive(String topic) {
        return rules.stream().anyMatch(r -> r.access().allowsSubscribe() && r.matchesTopic(topic));
    }
}
