package org.loopstand.plant.runtime;

import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.UnitCommand;

/**
 * One unit's share of a duty cycle on the owner thread, pairing its plant interface with its control-centre
 * link: decode what the link queued (bounded per cycle so a flood cannot hold the loop), then tick the
 * interface.
 */
public final class UnitDutyCycle {
    /** Most commands one unit handles per cycle; the rest wait in the bounded queue. */
    public static final int MAX_COMMANDS_PER_CYCLE = 64;

    private final UnitPlantInterface unit;
    private final ControlCentreLink link;
    private final MessageCodec codec;
    private long overflowSeen;
    private FaultHooks faults;
    private StatusDecoding statusDecoding;
    private CommandArrivals arrivals;
    private java.util.function.BooleanSupplier timeKnown = () -> true;

    /** Told of every command that came off the bus, decoded, before any command fault stage (owner thread). */
    public interface CommandArrivals {
        /** @param receivedNanos the clock's monotonic reading when it arrived, ns */
        void arrived(UnitCommand c, long receivedNanos);
    }

    /**
     * One decode of a controller status for every unit that got the same payload: a connection
     * fans one status message out to all its units as the same array, and decoding a status with
     * every area's ACE once per unit was the plant loop's largest cost at 10,000 units. Keyed by
     * array identity (payloads are never changed after receipt), one entry per connection's copy;
     * safe across threads. Shared by the plant's own units and by a unit host's {@link UnitProcess}es.
     */
    public static final class StatusDecoding {
        /** One entry per connection is enough; a few spare for a status that follows quickly. */
        private static final int ENTRIES = 64;
        private final MessageCodec codec;
        private final byte[][] payloads = new byte[ENTRIES][];
        @SuppressWarnings("unchecked")
        private final Decoded<ControllerStatus>[] decoded = new Decoded[ENTRIES];
        private int next;

        public StatusDecoding(MessageCodec codec) {
            this.codec = codec;
        }

        synchronized Decoded<ControllerStatus> decode(byte[] payload) {
            for (int i = 0; i < ENTRIES; i++) {
                if (payloads[i] == payload) {
                    return decoded[i];
                }
            }
            Decoded<ControllerStatus> d = codec.decode(payload, ControllerStatus.class);
            payloads[next] = payload;
            decoded[next] = d;
            next = (next + 1) % ENTRIES;
            return d;
        }
    }

    public UnitDutyCycle(UnitPlantInterface unit, ControlCentreLink link, MessageCodec codec) {
        this.unit = unit;
        this.link = link;
        this.codec = codec;
    }

    public UnitPlantInterface unit() {
        return unit;
    }

    public ControlCentreLink link() {
        return link;
    }

    /** Owner thread, before start: decode controller statuses through a cache shared with the other units. */
    public void shareStatusDecoding(StatusDecoding decoding) {
        this.statusDecoding = decoding;
    }

    /** Owner thread, before start: every decoded command is told to {@code watch} first (e.g. the pace keeper). */
    void watchCommandArrivals(CommandArrivals watch) {
        this.arrivals = watch;
    }

    /** Owner thread, before start: inbound commands pass the command-path fault stage. */
    void attachFaults(FaultHooks hooks) {
        this.faults = hooks;
    }

    /**
     * Owner thread, before start: while {@code known} says false (a followed clock standing until the plant's
     * next tick) controller statuses wait in their queue and the interface is not ticked, so a status is
     * never stamped with a time the plant has left behind, nor the watchdog judged on it (the next tick
     * may move the time on by seconds at once).
     */
    void judgeTimeOnlyWhen(java.util.function.BooleanSupplier known) {
        this.timeKnown = known;
    }

    /** @return work done (messages handled + telemetry published) */
    public int work() {
        int work = 0;
        link.announceIfDue();
        boolean known = timeKnown.getAsBoolean();
        for (ControlCentreLink.StatusArrival s; known && (s = link.pollStatus()) != null; work++) {
            Decoded<ControllerStatus> d = statusDecoding != null ? statusDecoding.decode(s.payload())
                    : codec.decode(s.payload(), ControllerStatus.class);
            String topicId = s.topicControllerId() == null ? "?" : s.topicControllerId();
            boolean retained = s.retained();
            d.message().ifPresent(status -> unit.onControllerStatus(status, topicId, retained));
        }
        ControlCentreLink.Received r;
        for (int i = 0; i < MAX_COMMANDS_PER_CYCLE && (r = link.pollCommand()) != null; i++, work++) {
            Decoded<UnitCommand> d = codec.decode(r.payload(), UnitCommand.class);
            if (d instanceof Decoded.Ok<UnitCommand> ok) {
                if (arrivals != null) {
                    arrivals.arrived(ok.value(), r.receivedNanos());
                }
                if (faults == null || !faults.interceptCommand(unit.unitId(), ok.value())) {
                    unit.onCommand(ok.value(), r.receivedNanos());
                }
            } else {
                CommandPeek.Peeked p = CommandPeek.peek(r.payload());
                unit.onMalformed(p.seq(), p.controllerId(), "payload refused by the codec: "
                        + d.rejection().map(Object::toString).orElse("?"));
            }
        }
        long overflow = link.overflowCount();
        if (overflow > overflowSeen) {
            overflowSeen = overflow;
            unit.reportOverflow(overflow);
        }
        return known ? work + unit.tick() : work;
    }
}
