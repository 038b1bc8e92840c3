package org.loopstand.plant.runtime;

import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.LongAdder;

import org.loopstand.plant.unit.UnitOutput;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.LinkState;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * One unit's logical link to the control centre, over a connection it may share with other units.
 * Inbound commands and controller statuses are handed over through bounded queues (a full queue
 * drops and counts, it never blocks the bus thread); outbound telemetry and acks go straight to the
 * bus and are dropped and counted while the link is down, never sent late. A link fault
 * ({@link #setFailed}) cuts this unit alone: nothing in, nothing out, link topic says offline.
 */
public final class ControlCentreLink implements UnitOutput {
    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(ControlCentreLink.class);
    /** A command as it came off the bus. */
    public record Received(byte[] payload, long receivedNanos) {
    }

    private final String unitId;
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final Clock clock;
    private final Qos telemetryQos;
    // Bounded; polled empty on every loop pass of every unit, which takes no lock in a LinkedBlockingQueue.
    private final LinkedBlockingQueue<Received> commands;
    private final LinkedBlockingQueue<StatusArrival> statuses = new LinkedBlockingQueue<>(64);
    private final AtomicLong linkSeq;
    private final LongAdder overflow = new LongAdder();
    private final LongAdder dropped = new LongAdder();
    private final LongAdder sendFailed = new LongAdder();
    private volatile boolean failed;
    private volatile org.loopstand.plant.journal.PlantRunJournal journal;
    private volatile PlantCounters counters;
    private org.loopstand.plant.fault.FaultyPublisher telemetryFaults;
    private final java.util.concurrent.atomic.AtomicBoolean announceDue = new java.util.concurrent.atomic.AtomicBoolean(true);

    public ControlCentreLink(String unitId, MessageBus bus, TopicTree topics, MessageCodec codec, Clock clock,
                    Qos telemetryQos, int commandQueueCapacity) {
        this.unitId = unitId;
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.clock = clock;
        this.telemetryQos = telemetryQos;
        this.commands = new LinkedBlockingQueue<>(commandQueueCapacity);
        this.linkSeq = new AtomicLong(clock.epochMillis());
    }

    public String unitId() {
        return unitId;
    }

    public String site() {
        return topics.site();
    }

    public MessageBus bus() {
        return bus;
    }

    /** Bus thread: queues a command; @return false (and counts) when the queue is full or the link is cut */
    public boolean offerCommand(byte[] payload, long receivedNanos) {
        if (failed) {
            return false;
        }
        if (!commands.offer(new Received(payload, receivedNanos))) {
            overflow.increment();
            return false;
        }
        return true;
    }

    /**
     * A controller status payload with the controller id of the topic it arrived on (null when the
     * topic is not a status topic of this tree); {@code retained} for the retained copy a subscription brings.
     */
    public record StatusArrival(String topicControllerId, byte[] payload, boolean retained) {
    }

    /** Bus thread: queues a controller status payload that arrived on {@code topicControllerId}'s topic. */
    public void offerStatus(String topicControllerId, byte[] payload, boolean retained) {
        if (!failed && !statuses.offer(new StatusArrival(topicControllerId, payload, retained))) {
            overflow.increment();
        }
    }

    /** Owner thread: @return next queued command or null */
    public Received pollCommand() {
        return commands.poll();
    }

    /** Owner thread: @return next queued status or null */
    public StatusArrival pollStatus() {
        return statuses.poll();
    }

    /** Journals every telemetry and ack this link sends or drops from now on (null: none). */
    public void journalTo(org.loopstand.plant.journal.PlantRunJournal j) {
        this.journal = j;
    }

    @Override
    public void telemetry(UnitTelemetry t) {
        if (telemetryFaults == null) {
            send(topics.unitTelemetry(unitId), t, telemetryQos, "UnitTelemetry", t.seq());
        } else if (failed || !bus.isConnected()) {
            dropped.increment();
            journalTelemetry(t, false, failed ? "linkCut" : "notConnected");
        } else {
            telemetryFaults.publishTelemetry(t);
            journalTelemetry(t, true, "throughFaultStage");
        }
    }

    /** Counts every telemetry and ack this link sends or drops from now on, as the journal records them. */
    public void countInto(PlantCounters c) {
        this.counters = c;
    }

    private void journalTelemetry(UnitTelemetry t, boolean sent, String why) {
        PlantCounters c = counters;
        if (c != null) {
            c.published("UnitTelemetry", sent, why);
        }
        org.loopstand.plant.journal.PlantRunJournal j = journal;
        if (j != null) {
            j.published(clock.epochMillis(), topics.unitTelemetry(unitId), "UnitTelemetry", t.seq(), sent, why,
                    codec.encode(t), null);
        }
    }

    /** Owner thread, before start: telemetry goes through this fault stage (same bus, same QoS). */
    public void setTelemetryFaults(org.loopstand.plant.fault.FaultyPublisher stage) {
        this.telemetryFaults = stage;
    }

    public Qos telemetryQos() {
        return telemetryQos;
    }

    @Override
    public void ack(CommandAck a) {
        send(topics.unitAck(unitId), a, Qos.AT_LEAST_ONCE, "CommandAck", a.seq());
    }

    private void send(String topic, Object message, Qos qos, String type, long seq) {
        byte[] payload;
        try {
            payload = codec.encode(message);
        } catch (IllegalArgumentException e) {
            // a bug upstream must not stop the plant loop; count and log it
            sendFailed.increment();
            LOG.error("{}: not sent, the codec refused it: {}", unitId, e.getMessage());
            return;
        }
        String why = send(new OutboundMessage(topic, payload, qos, false, 0));
        PlantCounters c = counters;
        if (c != null) {
            c.published(type, why == null, why);
        }
        org.loopstand.plant.journal.PlantRunJournal j = journal;
        if (j != null) {
            j.published(clock.epochMillis(), topic, type, seq, why == null, why, payload, null);
        }
    }

    /** Publishes the retained link state of this unit (online unless the link is cut). */
    public void announce() {
        publishLink(failed ? LinkState.OFFLINE : LinkState.ONLINE);
    }

    /** Any thread (e.g. a connection listener): asks for the link state to be published again. */
    public void requestAnnounce() {
        announceDue.set(true);
    }

    /** Owner thread: publishes the link state when asked to and connected (retained state after a reconnect). */
    public void announceIfDue() {
        if (bus.isConnected() && announceDue.compareAndSet(true, false)) {
            announce();
        }
    }

    /** @return the message to register as this unit's last will (offline, retained) */
    public static OutboundMessage lastWill(TopicTree topics, MessageCodec codec, String unitId, String clientId, long seq,
                                           long epochMs) {
        return new OutboundMessage(topics.unitLink(unitId),
                codec.encode(new LinkStatus(seq, epochMs, clientId, LinkState.OFFLINE)), Qos.AT_LEAST_ONCE, true, 0);
    }

    /** Cuts or restores this unit's link alone (fault injection). */
    public void setFailed(boolean cut) {
        if (cut == failed) {
            return;
        }
        if (cut) {
            publishLink(LinkState.OFFLINE);
            failed = true;
            commands.clear();
            statuses.clear();
        } else {
            failed = false;
            publishLink(LinkState.ONLINE);
        }
    }

    public boolean failed() {
        return failed;
    }

    private void publishLink(LinkState state) {
        if (!bus.isConnected()) {
            return;
        }
        byte[] payload = codec.encode(new LinkStatus(linkSeq.getAndIncrement(), clock.epochMillis(), bus.clientId(), state));
        bus.publish(new OutboundMessage(topics.unitLink(unitId), payload, Qos.AT_LEAST_ONCE, true, 0))
                .whenComplete((ok, e) -> {
                    if (e != null) {
                        sendFailed.increment();
                    }
                });
    }

    /** @return null when handed to the bus, else why not */
    private String send(OutboundMessage m) {
        if (failed || !bus.isConnected()) {
            dropped.increment(); // stale by the time the link is back: dropped, not replayed
            return failed ? "linkCut" : "notConnected";
        }
        bus.publish(m).whenComplete((ok, e) -> {
            if (e != null) {
                sendFailed.increment();
            }
        });
        return null;
    }

    /** @return commands or statuses lost because the intake queue was full */
    public long overflowCount() {
        return overflow.sum();
    }

    /** @return telemetry/acks not sent because the link was down */
    public long droppedCount() {
        return dropped.sum();
    }

    /** @return publishes the bus refused */
    public long sendFailedCount() {
        return sendFailed.sum();
    }
}
