package org.loopstand.plant.live;

import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * What the live view needs from the bus: the meters as published (after the fault stage, as a
 * controller sees them) and the controller's statuses. Bus threads only decode and store the latest.
 */
public final class LiveBusTap {
    private final MessageCodec codec = new MessageCodec();
    private final Clock clock;
    private final Map<String, Double> meteredFrequencyHz = new ConcurrentHashMap<>();
    private volatile ControllerStatus status;
    private volatile long statusAtMs;

    public LiveBusTap(Clock clock) {
        this.clock = clock;
    }

    /** Subscribes to the site's meters and controller statuses on {@code bus}. */
    public LiveBusTap subscribe(MessageBus bus, TopicTree topics) {
        bus.subscribe(topics.filterAll(TopicKind.AREA_METER), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), AreaMeter.class).message()
                        .ifPresent(a -> meteredFrequencyHz.put(a.area(), a.frequencyHz())));
        bus.subscribe(topics.filterAll(TopicKind.CONTROLLER_STATUS), Qos.AT_LEAST_ONCE,
                m -> codec.decode(m.payload(), ControllerStatus.class).message().ifPresent(s -> {
                    statusAtMs = clock.epochMillis();
                    status = s;
                }));
        return this;
    }

    /** @return the area's last metered frequency, Hz, or NaN */
    public double meteredFrequencyHz(String area) {
        return meteredFrequencyHz.getOrDefault(area, Double.NaN);
    }

    /** @return the controller's last status, or null */
    public ControllerStatus status() {
        return status;
    }

    /** @return when the last status arrived, epoch ms of the injected clock */
    public long statusAtMs() {
        return statusAtMs;
    }
}
