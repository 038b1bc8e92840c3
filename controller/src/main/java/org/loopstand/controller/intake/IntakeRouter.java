package org.loopstand.controller.intake;

import org.loopstand.controller.schedule.AreaSchedule;

import org.loopstand.controller.config.InputValidationSettings;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.LongAdder;
import java.util.function.Consumer;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.config.ControllerSettings;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.SiteArea;
import org.loopstand.controller.config.SiteTie;
import org.loopstand.controller.config.SiteUnit;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The controller's intake: bus listener threads stamp, parse the topic and decode + check the
 * payload (codec validation: stateless, thread-safe), then enqueue the decoded record into a bounded
 * queue ({@link #listener()}) and wake the cycle thread ({@link #onArrival}); the cycle thread calls
 * {@link #drain()}, which runs the stateful source checks (sequence, skew, range, frozen) and stores
 * the result, and then reads validated inputs. With several bus connections the decoding runs on
 * their delivery threads in parallel. Decoding never throws: rejections are counted per reason and
 * reported to the observer on the cycle thread.
 *
 * <p>Inputs, each with its own {@link ValidatedInput}:
 * <ul>
 *   <li>frequency of each area: primary source = the first meter heard in that area; any other
 *       meter of the area is the alternate source (used under the alternateSource policy);</li>
 *   <li>flow of each tie seen from each end area (+ = export from that area): primary = that area's
 *       primary meter; alternate = the other end's primary meter, sign flipped;</li>
 *   <li>unit telemetry: output checked for age, quality, sequence and skew; a unit whose
 *       telemetry fails is not eligible ({@code telemetryBad});</li>
 *   <li>schedules per area ({@link AreaSchedules}: a later one replaces those not yet in force);
 *       without one the site file's schedule is used if {@code scheduleFromSite}.</li>
 * </ul>
 * Cross check of each tie metered at both ends ({@code endsDisagree}): {@link TieFlowInputs}.
 * Not thread-safe except {@link #listener()} and the counters.
 */
public final class IntakeRouter {
    /** Largest difference between the two ends of a tie taken as agreement, MW (lossless ties, meter noise ≲ 1 MW). */
    public static final double TIE_ENDS_TOLERANCE_MW = TieFlowInputs.TIE_ENDS_TOLERANCE_MW;
    /** Evaluations (cycles) in a row of disagreement before the tie flow is unusable. */
    public static final int TIE_ENDS_DISAGREE_CYCLES = TieFlowInputs.TIE_ENDS_DISAGREE_CYCLES;

    private final ControllerSiteConfig site;
    private final ControllerSettings settings;
    private final Clock clock;
    private final MessageCodec codec;
    private final IntakeObserver observer;
    private final BlockingQueue<IntakeDecoder.Arrival> queue;
    private final IntakeDecoder decoder;
    private final LongAdder queueOverflow = new LongAdder();
    private final Map<String, AtomicLong> rejectedByReason = new ConcurrentHashMap<>();
    private final Map<String, AtomicLong> acksByOutcome = new ConcurrentHashMap<>();
    private final Map<String, ValidatedInput> frequency = new LinkedHashMap<>();
    private final Map<String, String> primaryMeter = new LinkedHashMap<>();
    private final TieFlowInputs tieFlow;
    private final Map<String, UnitTelemetry> telemetry = new LinkedHashMap<>();
    private final Map<String, SourceValidator> telemetryCheck = new LinkedHashMap<>();
    private final AreaSchedules schedules = new AreaSchedules();
    private final Set<String> skewReported = new HashSet<>();
    private Consumer<ClockTick> clockListener = t -> { };
    private volatile Runnable arrivalSignal = () -> { };
    private RouteProbe routeProbe;
    private long messagesRouted;
    private double replayRate = 1.0;

    public IntakeRouter(ControllerSiteConfig site, Clock clock, MessageCodec codec, IntakeObserver observer) {
        this.site = site;
        this.settings = site.settings();
        this.clock = clock;
        this.codec = codec;
        this.observer = observer == null ? new IntakeObserver() { } : observer;
        // polled empty on every pass of the agent: a LinkedBlockingQueue takes no lock for that
        this.queue = new LinkedBlockingQueue<>(settings.intakeQueueCapacity());
        this.decoder = new IntakeDecoder(site.siteId(), codec);
        long skew = settings.clockSkewLimitMs();
        for (SiteArea a : site.areas()) {
            frequency.put(a.id(), new ValidatedInput(settings.frequency().toSettings("frequency:" + a.id(), skew)));
        }
        this.tieFlow = new TieFlowInputs(site,
                (areaId, tieId) -> settings.tieFlow().toSettings("tieFlow:" + areaId + ":" + tieId, skew));
        for (SiteUnit u : site.units()) {
            telemetryCheck.put(u.id(), new SourceValidator(InputValidationSettings.builder("telemetry:" + u.id())
                    .maxAgeMs(settings.unitTelemetryMaxAgeMs()).clockSkewLimitMs(skew).build()));
        }
    }

    /** @param listener told of every clock tick (for {@code --clock bus}), on the draining thread */
    public void onClockTick(Consumer<ClockTick> listener) {
        this.clockListener = listener;
    }

    /**
     * Told of every message once it has been decoded, validated and stored (or rejected), on the
     * draining thread. For measurements (the bus benchmark); null removes it.
     */
    @FunctionalInterface
    public interface RouteProbe {
        /**
         * @param message     the message as the bus handed it over (its receivedNanos: bus arrival)
         * @param routedNanos the clock's monotonic time after routing, ns
         */
        void routed(InboundMessage message, long routedNanos);
    }

    /** @param probe told after each message is routed, or null for none */
    public void setRouteProbe(RouteProbe probe) {
        this.routeProbe = probe;
    }

    /** @return the topic filters to subscribe to, for this site */
    public List<String> subscriptions() {
        TopicTree tree = TopicTree.forSite(site.siteId());
        return List.of(tree.filterAll(TopicKind.AREA_METER), tree.filterAll(TopicKind.UNIT_TELEMETRY),
                tree.filterAll(TopicKind.UNIT_ACK), tree.filterAll(TopicKind.AREA_SCHEDULE), tree.clock());
    }

    /**
     * @param signal run on the bus thread after each message is queued (e.g. the agent runner's
     *               {@code wake}); must be cheap and never block
     */
    public void onArrival(Runnable signal) {
        this.arrivalSignal = signal == null ? () -> { } : signal;
    }

    /**
     * @return the bus listener: stamps, decodes and enqueues, never blocks; a full queue counts
     *         {@code queueFull}. Safe to call from several bus threads at once
     */
    public MessageListener listener() {
        return m -> {
            if (queue.offer(decoder.decode(m, m.topic(), m.payload(), clock.epochMillis()))) {
                arrivalSignal.run();
            } else {
                queueOverflow.increment();
                count(rejectedByReason, "queueFull");
            }
        };
    }

    /** Routes every queued message. @return how many were taken from the queue */
    public int drain() {
        int n = 0;
        IntakeDecoder.Arrival a;
        while ((a = queue.poll()) != null) {
            apply(a);
            RouteProbe probe = routeProbe;
            if (probe != null) {
                probe.routed(a.message(), clock.monotonicNanos());
            }
            n++;
        }
        return n;
    }

    /** Routes one message at once (used by tests; the bus path is {@link #listener()} + {@link #drain()}). */
    public void route(String topic, byte[] payload, long receivedAtMs) {
        apply(decoder.decode(null, topic, payload, receivedAtMs));
    }

    /** Stores a decoded message (stateful checks); cycle thread only. */
    private void apply(IntakeDecoder.Arrival a) {
        messagesRouted++;
        observer.onInput(a.topic(), a.payload(), a.receivedAtMs());
        if (a.value() == null) {
            reject(a.topic(), a.rejectReason(), a.rejectDetail());
            return;
        }
        String topic = a.topic();
        ParsedTopic p = a.parsed();
        long receivedAtMs = a.receivedAtMs();
        Object v = a.value();
        if (v instanceof AreaMeter m) {
            onMeter(topic, p, m, receivedAtMs);
        } else if (v instanceof UnitTelemetry t) {
            onTelemetry(topic, p, t, receivedAtMs);
        } else if (v instanceof CommandAck ack) {
            onAck(ack, receivedAtMs);
        } else if (v instanceof Schedule sc) {
            onSchedule(topic, p, sc);
        } else if (v instanceof ClockTick tick) {
            followRate(tick);
            clockListener.accept(tick);
        } else {
            reject(topic, "unknownTopic", "no route for " + v.getClass().getSimpleName());
        }
    }

    private void onMeter(String topic, ParsedTopic p, AreaMeter m, long receivedAtMs) {
        String area = p.area();
        String meter = p.id("meter");
        if (!m.area().equals(area) || !m.meter().equals(meter)) {
            reject(topic, "topicMismatch", "payload names area " + m.area() + " meter " + m.meter());
            return;
        }
        ValidatedInput f = frequency.get(area);
        if (f == null) {
            reject(topic, "unknownArea", "area " + area + " is not in the site file");
            return;
        }
        String primary = primaryMeter.computeIfAbsent(area, k -> meter);
        boolean isPrimary = primary.equals(meter);
        MeasuredValue fv = new MeasuredValue(m.frequencyHz(), m.sourceTime(), receivedAtMs,
                m.frequencyQuality().validity() == Validity.GOOD, m.seq());
        if (isPrimary) {
            noteSkew("meter:" + area + "/" + meter, f.acceptPrimary(fv), fv);
        } else if (f.alternate() != null) {
            noteSkew("meter:" + area + "/" + meter, f.acceptAlternate(fv), fv);
        }
        if (!isPrimary) {
            return; // tie flows come from each area's primary meter only
        }
        for (TieFlow t : m.ties()) {
            MeasuredValue own = new MeasuredValue(t.flowMw(), m.sourceTime(), receivedAtMs,
                    t.quality().validity() == Validity.GOOD, m.seq());
            if (!tieFlow.accept(area, t.tie(), own)) {
                count(rejectedByReason, "unknownTie");
            }
        }
    }

    private void onTelemetry(String topic, ParsedTopic p, UnitTelemetry t, long receivedAtMs) {
        SourceValidator v = telemetryCheck.get(p.unit());
        if (v == null) {
            reject(topic, "unknownUnit", "unit " + p.unit() + " is not in the site file");
            return;
        }
        if (!t.unit().equals(p.unit())) {
            reject(topic, "topicMismatch", "payload names unit " + t.unit());
            return;
        }
        MeasuredValue mv = new MeasuredValue(t.outputMw(), t.sourceTime(), receivedAtMs,
                t.outputQuality().validity() == Validity.GOOD, t.seq());
        Set<ValidationReason> r = v.accept(mv);
        noteSkew("unit:" + t.unit(), r, mv);
        if (!r.contains(ValidationReason.DUPLICATE) && !r.contains(ValidationReason.OUT_OF_ORDER)) {
            telemetry.put(t.unit(), t);
        }
    }

    private void onAck(CommandAck a, long receivedAtMs) {
        String key = a.outcome() == AckOutcome.ACCEPTED ? "accepted" : "refused:" + a.reason().name();
        count(acksByOutcome, key);
        observer.onAck(a, receivedAtMs);
    }

    private void onSchedule(String topic, ParsedTopic p, Schedule s) {
        if (!frequency.containsKey(p.area()) || !s.area().equals(p.area())) {
            reject(topic, frequency.containsKey(p.area()) ? "topicMismatch" : "unknownArea", "schedule for " + s.area());
            return;
        }
        schedules.receive(p.area(), s);
    }

    /** The clock skew limits follow the replay rate the plant's clock announces (skew is wall time). */
    private void followRate(ClockTick tick) {
        double rate = tick.running() && tick.rate() > 0 ? tick.rate() : replayRate;
        if (rate == replayRate) {
            return;
        }
        replayRate = rate;
        frequency.values().forEach(f -> f.scaleClockSkewLimit(rate));
        tieFlow.scaleClockSkewLimit(rate);
        telemetryCheck.values().forEach(t -> t.scaleClockSkewLimit(rate));
    }

    private void noteSkew(String source, Set<ValidationReason> reasons, MeasuredValue v) {
        for (ValidationReason r : reasons) {
            if ((r == ValidationReason.CLOCK_SKEW_AHEAD || r == ValidationReason.CLOCK_SKEW_BEHIND)
                    && skewReported.add(source + ":" + r.code())) {
                observer.onClockSkew(source, v.sourceTimeMs() - v.receivedAtMs());
            }
        }
    }

    private void reject(String topic, String reason, String detail) {
        count(rejectedByReason, reason);
        observer.onRejected(topic, reason, detail);
    }

    private static void count(Map<String, AtomicLong> m, String key) {
        m.computeIfAbsent(key, k -> new AtomicLong()).incrementAndGet();
    }

    // ---- what the cycle reads

    /** @return validated inputs of one area at controller time {@code nowMs} */
    public AreaCycleInputs areaInputs(String areaId, long nowMs) {
        ValidatedInput f = frequency.get(areaId);
        if (f == null) {
            throw new IllegalArgumentException("no area " + areaId);
        }
        Map<String, ValidatedValue> ties = new TreeMap<>();
        for (SiteTie t : site.tiesOf(areaId)) {
            ties.put(t.id(), tieFlow.evaluate(areaId, t, nowMs));
        }
        return new AreaCycleInputs(areaId, f.evaluate(nowMs), ties, schedule(areaId, nowMs), 0, 0);
    }

    /** @return the schedule in force at {@code nowMs}, the site's when none was received, or null */
    public AreaSchedule schedule(String areaId, long nowMs) {
        Schedule inForce = schedules.inForce(areaId, nowMs);
        if (inForce != null) {
            return new AreaSchedule(inForce.scheduledNetInterchangeMw(), inForce.scheduledFrequencyHz());
        }
        return settings.scheduleFromSite() ? site.siteSchedule(areaId) : null;
    }

    /** @return every unit with telemetry, as the cycle sees it at {@code nowMs} */
    public List<UnitState> unitStates(long nowMs) {
        List<UnitState> out = new ArrayList<>();
        for (SiteUnit u : site.units()) {
            UnitTelemetry t = telemetry.get(u.id());
            if (t == null) {
                continue;
            }
            boolean good = telemetryCheck.get(u.id()).evaluate(nowMs).usable();
            double min = Math.min(t.regulatingMinMw(), t.regulatingMaxMw());
            out.add(new UnitState(u.id(), u.area(), t.controlMode() == ControlMode.REMOTE,
                    t.status() == UnitStatus.ONLINE, good, t.setpointMw(), t.outputMw(), min, t.regulatingMaxMw(),
                    Math.max(0, t.rampMwPerMin()), Math.max(0, t.pulseRateMwPerMin()), t.acceptsSetpoints(),
                    t.sourceTime()));
        }
        return out;
    }

    // ---- counters and diagnostics

    /** @return rejected messages by reason code (decode error kinds, unknownTopic, queueFull, …) */
    public Map<String, Long> rejectedByReason() {
        Map<String, Long> out = new TreeMap<>();
        rejectedByReason.forEach((k, v) -> out.put(k, v.get()));
        return out;
    }

    /** @return acks by outcome: {@code accepted} and {@code refused:REASON} */
    public Map<String, Long> acksByOutcome() {
        Map<String, Long> out = new TreeMap<>();
        acksByOutcome.forEach((k, v) -> out.put(k, v.get()));
        return out;
    }

    public long queueOverflowCount() { return queueOverflow.sum(); }
    public long messagesRouted() { return messagesRouted; }
    /** @return the frequency input of an area (for diagnostics and tests) */
    public ValidatedInput frequencyInput(String areaId) { return frequency.get(areaId); }
    /** @return the flow input of a tie seen from one area */
    public ValidatedInput tieFlowInput(String areaId, String tieId) { return tieFlow.input(areaId, tieId); }
    /** @return the telemetry check of a unit */
    public SourceValidator telemetryCheck(String unitId) { return telemetryCheck.get(unitId); }
    /** @return the meter taken as primary in an area, or null before any was heard */
    public String primaryMeter(String areaId) { return primaryMeter.get(areaId); }
}
