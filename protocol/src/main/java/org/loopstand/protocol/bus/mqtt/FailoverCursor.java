package org.loopstand.protocol.bus.mqtt;

import java.util.Objects;

/**
 * Which broker node a link tries next, and how long it waits first. Not thread-safe: used by the
 * link's reconnect thread only.
 *
 * <ul>
 *   <li>A failed attempt moves on to the next node at once (0 ms) until every node was tried in this
 *       round; after a whole round failed it waits the capped exponential backoff, growing per round.</li>
 *   <li>A lost connection moves on to the next node (the lost one is likely the one that is down) after
 *       the first backoff step; a single-node list retries the same node.</li>
 *   <li>A connect to another node than the last connected one starts a clean session: the nodes of the
 *       cluster do not share sessions, and a clean start makes the client drop QoS 1 publishes still in
 *       flight towards the old node instead of sending them late to the new one.</li>
 * </ul>
 */
final class FailoverCursor {
    private final BrokerEndpoints endpoints;
    private final ReconnectBackoff backoff;
    private int index;
    private int failedInRound;
    private int rounds;
    private int lastConnected = -1;

    FailoverCursor(BrokerEndpoints endpoints, ReconnectBackoff backoff) {
        this.endpoints = Objects.requireNonNull(endpoints, "endpoints");
        this.backoff = Objects.requireNonNull(backoff, "backoff");
    }

    /** @return the node the next attempt goes to */
    String uri() {
        return endpoints.get(index);
    }

    /** @return index of the node the next attempt goes to, 0..size-1 */
    int index() {
        return index;
    }

    /** @return true when the next attempt must start a clean session (another node than the last one) */
    boolean switchingNode() {
        return lastConnected >= 0 && lastConnected != index;
    }

    /** @return the URI of the node last connected to, or null before the first connect */
    String lastConnectedUri() {
        return lastConnected < 0 ? null : endpoints.get(lastConnected);
    }

    /** The attempt on the current node succeeded. */
    void connected() {
        lastConnected = index;
        failedInRound = 0;
        rounds = 0;
    }

    /** @return delay before the next attempt, ms; moves to the next node */
    long failed() {
        failedInRound++;
        index = endpoints.next(index);
        if (failedInRound < endpoints.size()) {
            return 0;
        }
        failedInRound = 0;
        long delayMs = backoff.delayMs(Math.min(rounds, 30));
        rounds++;
        return delayMs;
    }

    /** @return delay before the first attempt after a lost connection, ms; moves to the next node */
    long lost() {
        index = endpoints.next(index);
        failedInRound = 0;
        rounds = 0;
        return backoff.delayMs(0);
    }

    /** @return attempts in a row that failed since the last connect, over all rounds */
    int failuresInRow() {
        return rounds * endpoints.size() + failedInRound;
    }
}
