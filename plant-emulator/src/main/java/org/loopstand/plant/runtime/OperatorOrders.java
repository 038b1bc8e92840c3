package org.loopstand.plant.runtime;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.LinkedBlockingQueue;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.topic.TopicTree;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Orders on the {@code faults} topic that the plant interfaces act on (other fault types belong to the
 * fault injector and are ignored here):
 * <ul>
 * <li>{@code returnToRemote} (start): the target units go back to remote control;</li>
 * <li>{@code setControlMode} (start, parameter {@code mode}: remote, local or off);</li>
 * <li>{@code unitLinkDown} start/stop: cuts/restores the target units' links, in any grouping.</li>
 * </ul>
 * Orders arrive on a bus thread and are applied on the owner thread by {@link #work()}.
 */
public final class OperatorOrders {
    private static final Logger LOG = LoggerFactory.getLogger(OperatorOrders.class);

    private final Map<String, UnitDutyCycle> cycles = new LinkedHashMap<>();
    private final MessageCodec codec;
    // polled empty on every loop pass: a LinkedBlockingQueue takes no lock for that
    private final LinkedBlockingQueue<byte[]> queue = new LinkedBlockingQueue<>(256);
    private volatile org.loopstand.plant.journal.PlantRunJournal journal;
    private org.loopstand.protocol.time.Clock journalClock;

    public OperatorOrders(List<UnitDutyCycle> units, MessageCodec codec) {
        units.forEach(h -> cycles.put(h.unit().unitId(), h));
        this.codec = codec;
    }

    public OperatorOrders subscribe(MessageBus bus, TopicTree topics) {
        bus.subscribe(topics.faults(), Qos.AT_LEAST_ONCE, m -> {
            if (!queue.offer(m.payload())) {
                LOG.warn("operator order queue full, order dropped");
            }
        });
        return this;
    }

    /** Journals every order received from now on, stamped with {@code clock} (null: none). */
    public void journalTo(org.loopstand.plant.journal.PlantRunJournal j, org.loopstand.protocol.time.Clock clock) {
        this.journalClock = clock;
        this.journal = j;
    }

    /** Owner thread: applies queued orders; @return orders handled */
    public int work() {
        int n = 0;
        for (byte[] p; (p = queue.poll()) != null; n++) {
            codec.decode(p, FaultOrder.class).message().ifPresent(o -> {
                org.loopstand.plant.journal.PlantRunJournal j = journal;
                if (j != null && FaultHooks.OPERATOR_ORDER_TYPES.contains(o.faultType())) {
                    j.operatorOrder(journalClock.epochMillis(), o);
                }
                apply(o);
            });
        }
        return n;
    }

    /** Applies one order now (owner thread). */
    public void apply(FaultOrder o) {
        for (String target : o.targets()) {
            UnitDutyCycle h = cycles.get(target);
            if (h == null) {
                continue;
            }
            switch (o.faultType()) {
                case "returnToRemote" -> {
                    if (o.action() == FaultAction.START) {
                        h.unit().setControlMode(ControlMode.REMOTE, "order " + o.orderId());
                    }
                }
                case "setControlMode" -> {
                    Object mode = o.parameters().get("mode");
                    try {
                        ControlMode m = ControlMode.valueOf(String.valueOf(mode).toUpperCase(Locale.ROOT));
                        if (o.action() == FaultAction.START) {
                            h.unit().setControlMode(m, "order " + o.orderId());
                        }
                    } catch (IllegalArgumentException e) {
                        LOG.warn("order {}: setControlMode needs parameter mode = remote|local|off, got {}", o.orderId(), mode);
                    }
                }
                case "unitLinkDown" -> h.link().setFailed(o.action() == FaultAction.START);
                default -> {
                    // someone else's fault type
                }
            }
        }
    }
}
