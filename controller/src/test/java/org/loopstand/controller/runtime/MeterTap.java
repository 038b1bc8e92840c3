package org.loopstand.controller.runtime;

import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.CompletableFuture;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Test-only fault injection on the plant's own connection: silences the meters of chosen areas and
 * adds a data error to the tie flows a chosen area's meter reports. Everything else passes through.
 * Only for the single thread of a study loop.
 */
final class MeterTap extends ForwardingBus {
    private final MessageCodec codec = new MessageCodec();
    /** areas whose meters stop publishing */
    final Set<String> silentAreas = new HashSet<>();
    /** offset added to every tie flow the named area's meter reports, MW */
    final Map<String, Double> tieErrorMwByArea = new HashMap<>();

    MeterTap(MessageBus inner) {
        super(inner);
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage m) {
        Optional<ParsedTopic> t = TopicTree.parse(m.topic());
        if (t.isEmpty() || t.get().kind() != TopicKind.AREA_METER) {
            return inner.publish(m);
        }
        String area = t.get().area();
        if (silentAreas.contains(area)) {
            return CompletableFuture.completedFuture(null);
        }
        Double err = tieErrorMwByArea.get(area);
        if (err == null) {
            return inner.publish(m);
        }
        AreaMeter a = codec.decode(m.payload(), AreaMeter.class).message().orElseThrow();
        List<TieFlow> ties = a.ties().stream().map(f -> new TieFlow(f.tie(), f.flowMw() + err, f.quality())).toList();
        AreaMeter bad = new AreaMeter(a.seq(), a.sourceTime(), a.area(), a.meter(), a.frequencyHz(), a.frequencyQuality(),
                ties, a.netInterchangeMw() + err * ties.size(), a.netInterchangeQuality());
        return inner.publish(new OutboundMessage(m.topic(), codec.encode(bad), m.qos(), m.retained(), m.expirySeconds()));
    }

}
