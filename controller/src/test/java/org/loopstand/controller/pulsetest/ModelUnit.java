package org.loopstand.controller.pulsetest;

import java.util.ArrayDeque;
import java.util.Deque;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Test double of a unit's plant interface with known parameters: a pulse moves the load reference at
 * {@code pulseRateMwPerMin}, the output follows the reference after {@code deadTimeMs}, limited to
 * {@code rampMwPerMin}. Faults: ignores pulses, slow (true ramp a fraction of the declared), swapped.
 */
final class ModelUnit {
    enum Fault { NONE, IGNORES_PULSES, SLOW, SWAPPED }

    final String unit;
    final double pulseRateMwPerMin;
    final double rampMwPerMin;
    final long deadTimeMs;
    final double minMw;
    final double maxMw;
    final long scanMs;
    Fault fault = Fault.NONE;
    double slowFactor = 0.5;
    boolean telemetryOn = true;
    boolean refuseAll;
    ControlMode mode = ControlMode.REMOTE;

    private final MessageBus bus;
    private final VirtualClock clock;
    private final TopicTree topics;
    private final MessageCodec codec = new MessageCodec();
    private final Deque<double[]> delayLine = new ArrayDeque<>();
    private double referenceMw;
    private double outputMw;
    private long pulseEndMs;
    private double pulseSign;
    private long lastStepMs;
    private long nextScanMs;
    private long seq;
    private long lastCommandSeq;
    int commandsReceived;

    ModelUnit(MessageBus bus, VirtualClock clock, TopicTree topics, String unit, double startMw, double minMw,
            double maxMw, double rampMwPerMin, double pulseRateMwPerMin, long deadTimeMs, long scanMs) {
        this.bus = bus;
        this.clock = clock;
        this.topics = topics;
        this.unit = unit;
        this.referenceMw = startMw;
        this.outputMw = startMw;
        this.minMw = minMw;
        this.maxMw = maxMw;
        this.rampMwPerMin = rampMwPerMin;
        this.pulseRateMwPerMin = pulseRateMwPerMin;
        this.deadTimeMs = deadTimeMs;
        this.scanMs = scanMs;
        this.lastStepMs = clock.epochMillis();
        this.nextScanMs = lastStepMs;
        bus.subscribe(topics.unitCommand(unit), Qos.AT_LEAST_ONCE, m ->
                codec.decode(m.payload(), UnitCommand.class).message().ifPresent(this::onCommand));
    }

    private void onCommand(UnitCommand c) {
        commandsReceived++;
        long now = clock.epochMillis();
        RefusalReason reason = null;
        if (now > c.validUntil()) {
            reason = RefusalReason.EXPIRED;
        } else if (c.seq() <= lastCommandSeq) {
            reason = RefusalReason.OUT_OF_ORDER;
        } else if (refuseAll) {
            reason = RefusalReason.AT_LIMIT;
        }
        if (reason == null) {
            lastCommandSeq = c.seq();
            if (fault != Fault.IGNORES_PULSES) {
                double s = c.direction() == PulseDirection.RAISE ? 1 : -1;
                pulseSign = fault == Fault.SWAPPED ? -s : s;
                pulseEndMs = now + c.durationMs();
            }
        }
        CommandAck ack = new CommandAck(seq++, now, unit, c.seq(), c.controllerId(),
                reason == null ? AckOutcome.ACCEPTED : AckOutcome.REJECTED, reason, null);
        bus.publish(OutboundMessage.of(topics.unitAck(unit), codec.encode(ack), Qos.AT_LEAST_ONCE));
    }

    /** Advances the model to the clock's time and publishes telemetry when a scan is due. */
    void step() {
        long now = clock.epochMillis();
        long dt = now - lastStepMs;
        if (dt > 0) {
            long active = Math.max(0, Math.min(now, pulseEndMs) - lastStepMs);
            referenceMw += pulseSign * pulseRateMwPerMin * active / 60_000.0;
            referenceMw = Math.max(minMw, Math.min(maxMw, referenceMw));
            delayLine.addLast(new double[] {now, referenceMw});
            double delayedRef = outputMw;
            while (!delayLine.isEmpty() && delayLine.peekFirst()[0] <= now - deadTimeMs) {
                delayedRef = delayLine.pollFirst()[1];
                lastDelayed = delayedRef;
            }
            delayedRef = Double.isNaN(lastDelayed) ? outputMw : lastDelayed;
            double ramp = fault == Fault.SLOW ? rampMwPerMin * slowFactor : rampMwPerMin;
            double maxMove = ramp * dt / 60_000.0;
            outputMw += Math.max(-maxMove, Math.min(maxMove, delayedRef - outputMw));
            lastStepMs = now;
        }
        if (telemetryOn && now >= nextScanMs) {
            nextScanMs += scanMs;
            UnitTelemetry t = new UnitTelemetry(seq++, now, unit, outputMw, Quality.GOOD, referenceMw,
                    UnitStatus.ONLINE, mode, minMw, maxMw, rampMwPerMin, pulseRateMwPerMin, false, lastCommandSeq);
            bus.publish(OutboundMessage.of(topics.unitTelemetry(unit), codec.encode(t), Qos.AT_MOST_ONCE));
        }
    }

    private double lastDelayed = Double.NaN;

    double outputMw() {
        return outputMw;
    }
}
