package org.loopstand.brokernode.counters;

import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;
import org.apache.activemq.artemis.api.core.Message;
import org.apache.activemq.artemis.api.core.SimpleString;
import org.apache.activemq.artemis.core.postoffice.RoutingStatus;
import org.apache.activemq.artemis.core.server.MessageReference;
import org.apache.activemq.artemis.core.server.ServerConsumer;
import org.apache.activemq.artemis.core.server.ServerSession;
import org.apache.activemq.artemis.core.server.impl.AckReason;
import org.apache.activemq.artemis.core.server.plugin.ActiveMQServerMessagePlugin;
import org.apache.activemq.artemis.core.transaction.Transaction;

/**
 * A node's own message counts by topic family (the MQTT topic's last level: telemetry, command, ack, reading,
 * reference, measured, status, ...), taken where Artemis routes, expires and kills messages. The queues' own
 * counters ({@link CountersSnapshot}) say where messages sit; these say what came in and from whom: a publish of
 * an MQTT client, or a message a peer node forwarded over its cluster bridge (core protocol). Monotonic from the
 * node's start: the hosts bench reads them at its window's start and end and takes the difference.
 */
public final class NodeCounters implements ActiveMQServerMessagePlugin {
    private final Map<String, LongAdder> counts = new ConcurrentHashMap<>();

    /** @return the family of an address or MQTT topic: its last level ('.' or '/' separated) */
    public static String family(String address) {
        int cut = Math.max(address.lastIndexOf('.'), address.lastIndexOf('/'));
        String f = cut < 0 ? address : address.substring(cut + 1);
        if (f.isEmpty()) {
            return "-";
        }
        // it becomes part of a key=value line: Artemis's own addresses hold '=' (…ActiveMQServerImpl_name=n3).
        // Called for every message a node routes: a scan, no regular expression (compiled per call by replaceAll)
        char[] chars = null;
        for (int i = 0; i < f.length(); i++) {
            if (!keyChar(f.charAt(i))) {
                if (chars == null) {
                    chars = f.toCharArray();
                }
                chars[i] = '_';
            }
        }
        return chars == null ? f : new String(chars);
    }

    /** @return true for the characters a family keeps: letters and digits of ASCII, {@code _ * # + -} */
    private static boolean keyChar(char c) {
        return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9'
                || c == '_' || c == '*' || c == '#' || c == '+' || c == '-';
    }

    private void count(String key) {
        counts.computeIfAbsent(key, k -> new LongAdder()).increment();
    }

    private static String familyOf(Message m) {
        SimpleString a = m.getAddressSimpleString();
        return a == null ? "-" : family(a.toString());
    }

    @Override
    public void afterSend(ServerSession session, Transaction tx, Message message, boolean direct, boolean noAutoCreateQueue,
                          RoutingStatus result) {
        // MQTT: a client's publish; CORE: a peer node's bridge forwarding what one of its clients published
        String protocol = session == null || session.getRemotingConnection() == null ? "internal"
                : session.getRemotingConnection().getProtocolName();
        // Artemis names an MQTT connection's protocol with its version ("MQTT" + version); bridges speak CORE
        String from = protocol != null && protocol.toUpperCase(java.util.Locale.ROOT).startsWith("MQTT") ? "client" : "peer";
        String outcome = switch (result == null ? RoutingStatus.OK : result) {
            case OK -> "in";
            case NO_BINDINGS -> "noSubscriber";
            case DUPLICATED_ID -> "duplicate";
            default -> "notRouted";
        };
        count(outcome + "." + from + "." + familyOf(message));
    }

    @Override
    public void onSendException(ServerSession session, Transaction tx, Message message, boolean direct,
                                boolean noAutoCreateQueue, Exception e) {
        count("sendFailed." + familyOf(message));
    }

    @Override
    public void messageExpired(MessageReference ref, SimpleString messageExpiryAddress, ServerConsumer consumer) {
        String family = familyOf(ref.getMessage());
        count("expired." + where(ref) + "." + family);
        if (family.equals("command") && ref.getQueue() != null) {
            // whose copy it was: a command reaches every subscriber of the wildcard, and only the copy towards the
            // unit's own interface matters (the bench attributes it by the unit and the queue's client or peer)
            count("expiredCommand." + destination(ref.getQueue().getName().toString()) + "." + unitOf(ref.getMessage()));
            // how long it was valid for (its MQTT expiry) and how long it sat in this node, in 500 ms steps
            Message m = ref.getMessage();
            if (m.getTimestamp() > 0 && m.getExpiration() > 0) {
                count("expiredCommandValidityMs." + step(m.getExpiration() - m.getTimestamp()));
            }
        }
    }

    private static long step(long ms) {
        return Math.max(0, ms) / 500 * 500;
    }

    /** @return the client id of a subscription queue ({@code clientId.filter}), or {@code bridge-PEERID} */
    static String destination(String queueName) {
        if (CountersSnapshot.isStoreAndForward(queueName)) {
            return "bridge-" + queueName.substring(queueName.lastIndexOf('.') + 1);
        }
        int dot = queueName.indexOf('.');
        return dot < 0 ? queueName : queueName.substring(0, dot);
    }

    /** @return the unit level of a unit topic's address ({@code ….unit.UNIT.command}), "-" if none */
    static String unitOf(Message m) {
        SimpleString a = m.getAddressSimpleString();
        if (a == null) {
            return "-";
        }
        String s = a.toString().replace('/', '.');
        int last = s.lastIndexOf('.');
        int before = last < 0 ? -1 : s.lastIndexOf('.', last - 1);
        return before < 0 ? "-" : s.substring(before + 1, last);
    }

    @Override
    public void messageAcknowledged(Transaction tx, MessageReference ref, AckReason reason, ServerConsumer consumer) {
        if (reason == AckReason.KILLED || reason == AckReason.REPLACED) {
            count((reason == AckReason.KILLED ? "killed." : "replaced.") + where(ref) + "." + familyOf(ref.getMessage()));
        }
    }

    /** @return "bridge" when the message sat in a store-and-forward queue towards a peer, else "subscription" */
    private static String where(MessageReference ref) {
        return ref.getQueue() != null && CountersSnapshot.isStoreAndForward(ref.getQueue().getName().toString())
                ? "bridge" : "subscription";
    }

    /** @return every count so far, by key ({@code outcome.from.family}, {@code expired.where.family}, ...) */
    public Map<String, Long> snapshot() {
        Map<String, Long> m = new TreeMap<>();
        counts.forEach((k, v) -> m.put(k, v.sum()));
        return m;
    }
}
