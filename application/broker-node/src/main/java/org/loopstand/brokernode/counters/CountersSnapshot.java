package org.loopstand.brokernode.counters;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Map;
import java.util.TreeMap;
import org.apache.activemq.artemis.api.core.SimpleString;
import org.apache.activemq.artemis.core.paging.PagingStore;
import org.apache.activemq.artemis.core.postoffice.Binding;
import org.apache.activemq.artemis.core.postoffice.BindingType;
import org.apache.activemq.artemis.core.server.ActiveMQServer;
import org.apache.activemq.artemis.core.server.Queue;
import org.apache.activemq.artemis.core.server.cluster.Bridge;
import org.apache.activemq.artemis.core.server.cluster.ClusterConnection;

/**
 * One reading of a node's counters, as {@code key=value} lines: the message counts of {@link NodeCounters} and,
 * summed per kind of queue, Artemis's own queue counters (messages added, acknowledged, expired, killed; and
 * what sits in them at the reading). Kinds: {@code subscription.FAMILY} (an MQTT client's subscription queue, by
 * the family of its filter) and {@code bridge.PEER_NODE_ID} (the store-and-forward queue of this node's cluster
 * bridge to that peer). Gauges (what a queue holds, address sizes) start with {@code gauge.}; every other value
 * only grows while the queue exists (a client that reconnects gets a new queue, so the bench's window
 * differences of {@code queue.*} can fall: the message counts of {@link NodeCounters} cannot).
 *
 * <p>Artemis counts no message dropped by an address's DROP policy (it logs AMQ222039 once when the address is
 * full); {@code gauge.addressesFull} and {@code gauge.addressBytesMax} say whether any address was full.
 */
public final class CountersSnapshot {
    /** Artemis's prefix of the store-and-forward queues of a cluster connection's bridges. */
    static final String SF_PREFIX = "$.artemis.internal.sf.";

    private CountersSnapshot() {
    }

    static boolean isStoreAndForward(String queueName) {
        return queueName.startsWith(SF_PREFIX);
    }

    /** @return the reading now, by key */
    public static Map<String, Long> read(ActiveMQServer server, NodeCounters counts) throws Exception {
        Map<String, Long> m = new TreeMap<>();
        counts.snapshot().forEach((k, v) -> m.put("count." + k, v));
        long remote = 0;
        for (Binding b : (Iterable<Binding>) server.getPostOffice().getAllBindings()::iterator) {
            if (b.getType() == BindingType.REMOTE_QUEUE) {
                remote++;
                continue;
            }
            if (b.getType() != BindingType.LOCAL_QUEUE || !(b.getBindable() instanceof Queue q)) {
                continue;
            }
            String name = q.getName().toString();
            String kind = isStoreAndForward(name) ? "bridge." + name.substring(name.lastIndexOf('.') + 1)
                    : q.isInternalQueue() ? "internal" : "subscription." + NodeCounters.family(q.getAddress().toString());
            m.merge("queue." + kind + ".queues", 1L, Long::sum);
            m.merge("queue." + kind + ".added", q.getMessagesAdded(), Long::sum);
            m.merge("queue." + kind + ".acked", q.getMessagesAcknowledged(), Long::sum);
            m.merge("queue." + kind + ".expired", q.getMessagesExpired(), Long::sum);
            m.merge("queue." + kind + ".killed", q.getMessagesKilled(), Long::sum);
            m.merge("gauge.queue." + kind + ".held", q.getMessageCount(), Long::sum);
        }
        m.put("gauge.remoteBindings", remote);
        long full = 0;
        long biggest = 0;
        for (SimpleString a : server.getPagingManager().getStoreNames()) {
            PagingStore ps = server.getPagingManager().getPageStore(a);
            if (ps != null) {
                full += ps.isFull() ? 1 : 0;
                biggest = Math.max(biggest, ps.getAddressSize());
            }
        }
        // the cluster as this node sees it: bridges towards peers that are connected now
        long bridges = 0;
        for (ClusterConnection cc : server.getClusterManager().getClusterConnections()) {
            for (Bridge b : cc.getBridges()) {
                bridges += b.isConnected() ? 1 : 0;
            }
        }
        m.put("gauge.bridgesConnected", bridges);
        m.put("gauge.addressesFull", full);
        m.put("gauge.addressBytesMax", biggest);
        return m;
    }

    /** Writes the reading to {@code file} (through a temporary file, so a reader never sees half of it). */
    public static void write(Path file, String nodeId, Map<String, Long> reading) throws IOException {
        StringBuilder out = new StringBuilder("nodeId=").append(nodeId).append('\n');
        reading.forEach((k, v) -> out.append(k).append('=').append(v).append('\n'));
        Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
        Files.writeString(tmp, out, StandardCharsets.UTF_8);
        Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
    }
}
