package org.loopstand.plant.profile;

import java.io.IOException;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Another payload and topic layout for the controller's side of the bus, for controllers and gateways
 * that cannot change theirs: topic templates, field names, unit scale factors, sign flips and
 * timestamp forms per message kind. The plant publishes and accepts through it ({@link ProfiledBus});
 * its journal keeps the rig's own form. Kinds the profile does not name keep the rig's layout.
 *
 * @param name     the profile's name
 * @param site     the site id the topics are built for
 * @param mappings the kinds the profile changes
 */
public record WireProfile(String name, String site, Map<TopicKind, MessageMapping> mappings) {
    private static final ObjectMapper JSON = new ObjectMapper();

    public WireProfile {
        mappings = Map.copyOf(mappings);
    }

    /** @return the message as it goes on the profiled wire (topic and payload) */
    public OutboundMessage toWire(OutboundMessage rig) {
        Optional<ParsedTopic> t = TopicTree.parse(rig.topic()).filter(p -> p.site().equals(site));
        MessageMapping m = t.map(p -> mappings.get(p.kind())).orElse(null);
        if (m == null) {
            return rig;
        }
        byte[] payload = rig.payload();
        try {
            JsonNode n = JSON.readTree(payload);
            if (n instanceof ObjectNode o) {
                m.toWire(o);
                payload = JSON.writeValueAsBytes(o);
            }
        } catch (IOException e) {
            // not JSON (a fault stage's garbage on purpose): only the topic is mapped
        }
        return new OutboundMessage(m.wireTopic(site, t.get().ids()), payload, rig.qos(), rig.retained(), rig.expirySeconds());
    }

    /**
     * @param problems gets one line per mapped field that could not be read back (naming it and its form)
     * @return the message in the rig's layout; a wire topic of no mapped kind passes unchanged
     */
    public InboundMessage toRig(InboundMessage wire, List<String> problems) {
        for (MessageMapping m : mappings.values()) {
            List<String> ids = m.idsOf(site, wire.topic());
            if (ids == null) {
                continue;
            }
            byte[] payload = wire.payload();
            try {
                JsonNode n = JSON.readTree(payload);
                if (n instanceof ObjectNode o) {
                    m.toRig(o, problems);
                    payload = JSON.writeValueAsBytes(o);
                }
            } catch (IOException e) {
                // not JSON: the codec refuses it with its own reason
            }
            String topic = TopicTree.forSite(site).topic(m.kind(), ids.toArray(String[]::new));
            return new InboundMessage(topic, payload, wire.qos(), wire.retained(), wire.duplicate(), wire.receivedNanos());
        }
        return wire;
    }

    /** @return the wire filter for a rig topic or filter ({@code +} in id levels); others unchanged */
    public String toWireFilter(String rigFilter) {
        String root = TopicTree.forSite(site).root() + "/";
        if (!rigFilter.startsWith(root)) {
            return rigFilter;
        }
        List<String> levels = Arrays.asList(rigFilter.substring(root.length()).split("/", -1));
        for (MessageMapping m : mappings.values()) {
            List<String> template = m.kind().levelTemplate();
            if (template.size() != levels.size()) {
                continue;
            }
            List<String> ids = new java.util.ArrayList<>();
            boolean fits = true;
            for (int i = 0; i < levels.size() && fits; i++) {
                String tl = template.get(i);
                if (tl.startsWith("{")) {
                    ids.add(levels.get(i));
                } else {
                    fits = tl.equals(levels.get(i));
                }
            }
            if (fits) {
                return m.wireTopic(site, ids);
            }
        }
        return rigFilter;
    }
}
