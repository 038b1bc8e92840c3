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
 * Test-only fault injection on the plant's own connection: silences the meters of chosen areas, adds
 * a data error to the tie flows a chosen area's meter reports, or sticks its frequency at a value. Everything else passes through.
 * Only for the single thread of a study loop.
 */
final class MeterTap extends ForwardingBus {
    private final MessageCodec codec = new MessageCodec();
    /** areas whose meters stop publishing */
    final Set<String> silentAreas = new HashSet<>();
    /** offset added to every tie flow the named area's meter reports, MW */
    final Map<String, Double> tieErrorMwByArea = new HashMap<>();
    /** frequency the named area's meter reports instead of the measured one (a stuck value), Hz */
    final Map<String, Double> stuckFrequencyHzByArea = new HashMap<>();

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
        Double stuckHz = stuckFrequencyHzByArea.get(area);
        if (err == null && stuckHz == null) {
            return inner.publish(m);
        }
        double errMw = err == null ? 0 : err;
        AreaMeter a = codec.decode(m.payload(), AreaMeter.class).message().orElseThrow();
        List<TieFlow> ties = a.ties().stream().map(f -> new TieFlow(f.tie(), f.flowMw() + errMw, f.quality())).toList();
        AreaMeter bad = new AreaMeter(a.seq(), a.sourceTime(), a.area(), a.meter(),
                stuckHz == null ? a.frequencyHz() : stuckHz, a.frequencyQuality(),
                ties, a.netInterchangeMw() + errMw * ties.size(), a.netInterchangeQuality());
        return inner.publish(new OutboundMessage(m.topic(), codec.encode(bad), m.qos(), m.retained(), m.expirySeconds()));
    }

}
