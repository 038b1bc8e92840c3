package org.loopstand.controller.pulsetest;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.loopstand.controller.pulsetest.plan.PlanException;
import org.loopstand.controller.pulsetest.governor.GovernorAnswerTracker;
import org.loopstand.controller.pulsetest.governor.GovernorSpec;
import org.loopstand.controller.pulsetest.plan.PlanLimits;
import org.loopstand.controller.pulsetest.plan.PlanSettings;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.programme.DeclaredFigures;
import org.loopstand.controller.pulsetest.programme.ProgrammeStep;
import org.loopstand.controller.pulsetest.programme.PulseProgramme;
import org.loopstand.controller.pulsetest.programme.TimedPulse;
import org.loopstand.controller.pulsetest.programme.UnitDeclaration;
import org.loopstand.controller.pulsetest.safety.AbortSwitch;
import org.loopstand.controller.pulsetest.safety.SafetyGate;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Sends a plan's pulse programme to one unit over the bus and records the answer. An {@link Agent}:
 * driven by an AgentRunner in production, by hand after advancing a virtual clock in tests.
 *
 * <p>Order: first telemetry (the programme is expanded and checked against the caps), a steady unit
 * (own output and frequency within the plan's bands for {@code steadyForS}, else refused after
 * {@code steadyTimeoutS}), then the steps, each ending only when the unit has settled (see
 * {@link StepSequencer}).
 *
 * <p>Stops at once, sending nothing further, when the abort switch is pressed, when {@link #abortNow} is
 * called (a signal), when good telemetry is silent for more than {@code telemetryLossScans} scan periods,
 * when the bus drops, when the unit leaves online/remote, when its output leaves the excursion cap, or when
 * the duration cap is reached.
 */
public final class PulseTestRunner implements Agent {
    /** Controller id the test's commands carry. */
    public static final String CONTROLLER_ID = "pulse-test";
    private static final long DEFAULT_SCAN_MS = 1000;

    private final MessageBus bus;
    private final Clock clock;
    private final TopicTree topics;
    private final MessageCodec codec = new MessageCodec();
    private final String unitId;
    private final TestPlan plan;
    private final UnitDeclaration siteDeclaration;
    private final PlanLimits caps;
    private final long epoch;
    private final AbortSwitch abort;
    private final long startTimeoutMs;
    private final UnitObservations seen;
    private final List<TelemetryPoint> telemetry;
    private final List<FrequencyPoint> frequency;
    private final List<SentPulse> sent = new ArrayList<>();
    private final List<String> notes = new ArrayList<>();
    private final long startedMs;
    private RunState state = RunState.AWAITING_TELEMETRY;
    private String stopReason = "";
    private UnitDeclaration declaration;
    private PulseProgramme programme;
    private StepSequencer sequencer;
    private long programmeStartMs = -1;
    private long steadyCheckFromMs = -1;
    private GovernorSpec governor;
    private double requestedMw = Double.NaN;
    private volatile String externalAbort;
    private volatile PulseTestProgress progress;
    private long stoppedMs = -1;
    private long nextSeq;
    private CommandSigner signer;

    /**
     * @param siteDeclaration declared data from the site file, or null to take it from telemetry
     * @param caps            excursion and duration caps in force (see {@link SafetyGate#caps})
     * @param epoch           controller epoch the commands carry, ≥ 0
     * @param startTimeoutS   how long to wait for the unit's first telemetry, s
     */
    public PulseTestRunner(MessageBus bus, Clock clock, TopicTree topics, String unitId, TestPlan plan,
            UnitDeclaration siteDeclaration, PlanLimits caps, long epoch, AbortSwitch abort, double startTimeoutS) {
        this.bus = bus;
        this.clock = clock;
        this.topics = topics;
        this.unitId = unitId;
        this.plan = plan;
        this.siteDeclaration = siteDeclaration;
        this.caps = caps;
        this.epoch = epoch;
        this.abort = abort;
        this.startTimeoutMs = Math.round(startTimeoutS * 1000);
        this.seen = new UnitObservations(unitId, CONTROLLER_ID, clock);
        this.telemetry = seen.telemetry();
        this.frequency = seen.frequency();
        this.startedMs = clock.epochMillis();
        // Seq rises across runs (the unit refuses a seq it has seen from this controller id).
        this.nextSeq = startedMs;
    }

    /**
     * Removes the unit's expected governor answer to its area's measured frequency from every reading
     * (the grid's answer, not the unit's); also has the start wait for a steady frequency. Call before
     * {@link #onStart()}; without it the output is judged as measured and frequency is not checked.
     */
    public PulseTestRunner removeGovernorAnswer(GovernorSpec spec) {
        this.governor = spec;
        seen.trackGovernor(spec == null ? null : new GovernorAnswerTracker(spec));
        return this;
    }

    /** Signs every pulse from now on (call before the run starts); without it pulses go out unsigned. */
    public PulseTestRunner signCommandsWith(CommandSigner commandSigner) {
        this.signer = commandSigner;
        return this;
    }

    @Override
    public void onStart() {
        bus.subscribe(topics.unitTelemetry(unitId), Qos.AT_MOST_ONCE, m -> seen.receive(m, UnitTelemetry.class));
        bus.subscribe(topics.unitAck(unitId), Qos.AT_LEAST_ONCE, m -> seen.receive(m, CommandAck.class));
        if (governor != null) {
            bus.subscribe(topics.filterAreaMeters(governor.area()), Qos.AT_MOST_ONCE,
                    m -> seen.receive(m, AreaMeter.class));
        }
    }

    @Override
    public int doWork() {
        if (isDone()) {
            return 0;
        }
        int work = seen.drain();
        long now = clock.epochMillis();
        work += step(now);
        publishProgress(now);
        return work;
    }

    private int step(long now) {
        if (externalAbort != null) {
            stop(RunState.ABORTED, externalAbort, now);
            return 1;
        }
        if (state == RunState.AWAITING_TELEMETRY) {
            if (seen.latest() != null && seen.lastGoodMs() >= 0) {
                prepare(now);
                return 1;
            }
            if (now - startedMs > startTimeoutMs) {
                stop(RunState.ABORTED, "no good telemetry from unit " + unitId + " within "
                        + startTimeoutMs / 1000.0 + " s", now);
            }
            return 0;
        }
        Optional<String> why = abortReason(now);
        if (why.isPresent()) {
            stop(state == RunState.AWAITING_STEADY ? RunState.REFUSED : RunState.ABORTED, why.get(), now);
            return 1;
        }
        if (state == RunState.AWAITING_STEADY) {
            return awaitSteady(now);
        }
        int work = 0;
        TimedPulse due;
        while ((due = sequencer.nextDue(now)) != null) {
            send(due, sequencer.current().index(), now);
            work++;
        }
        ProgrammeStep current = sequencer.current();
        if (now >= sequencer.nominalEndMs() && sequencer.endStepIfDue(now, settled(current, now))) {
            work++;
        }
        if (sequencer.finished()) {
            stop(RunState.FINISHED, "", now);
        }
        return work;
    }

    /** Expands the programme at the first reading (refusing early), then waits for a steady unit. */
    private void prepare(long now) {
        if (expand(now)) {
            state = RunState.AWAITING_STEADY;
            steadyCheckFromMs = now;
        }
    }

    private int awaitSteady(long now) {
        PlanSettings s = plan.settings();
        Steadiness st = Steadiness.over(telemetry, frequency, now, steadyCheckFromMs, s.steadyForS(),
                s.steadyOutputBandMw(), s.noiseThresholdMw(), governor == null ? Double.NaN : governor.nominalHz(),
                s.steadyFrequencyBandHz());
        if (st.steady()) {
            notes.add("steady before the first step: " + st.describe());
            if (expand(now)) { // from the output now: the unit may have drifted while the test waited
                sequencer = new StepSequencer(programme, now, s.settleTimeoutS());
                programmeStartMs = now;
                requestedMw = programme.startMw();
                state = RunState.RUNNING;
            }
            return 1;
        }
        if (now - steadyCheckFromMs > Math.round(s.steadyTimeoutS() * 1000)) {
            stop(RunState.REFUSED, String.format(Locale.ROOT, "refusing to start: the unit was not steady within "
                    + "%.0f s: %s", s.steadyTimeoutS(), st.describe()), now);
            return 1;
        }
        return 0;
    }

    private boolean settled(ProgrammeStep step, long now) {
        return step == null || StepSequencer.settled(telemetry, step, now, sequencer.nominalEndMs(), plan.settings());
    }

    /** @return true when the programme expanded within the caps; else the run is refused */
    private boolean expand(long now) {
        UnitTelemetry t = seen.latest();
        if (t.status() != UnitStatus.ONLINE || t.controlMode() != ControlMode.REMOTE) {
            stop(RunState.REFUSED, "unit " + unitId + " is " + t.status().name().toLowerCase(Locale.ROOT) + " in "
                    + t.controlMode().name().toLowerCase(Locale.ROOT) + " mode; the test needs online and remote", now);
            return false;
        }
        if (declaration == null) {
            try {
                declaration = DeclaredFigures.resolve(unitId, siteDeclaration, t, notes);
            } catch (IllegalArgumentException e) {
                stop(RunState.REFUSED, e.getMessage(), now);
                return false;
            }
        }
        try {
            programme = PulseProgramme.expand(plan, declaration, t.outputMw());
        } catch (PlanException e) {
            stop(RunState.REFUSED, "refusing to start: " + String.join("; ", e.problems()), now);
            return false;
        }
        Optional<String> capRefusal = SafetyGate.checkCaps(programme, caps);
        if (capRefusal.isPresent()) {
            stop(RunState.REFUSED, capRefusal.get(), now);
            return false;
        }
        return true;
    }

    private Optional<String> abortReason(long now) {
        if (abort.abortRequested()) {
            return Optional.of("stopped by the operator (abort key)");
        }
        if (!bus.isConnected()) {
            return Optional.of("bus connection lost");
        }
        long scanMs = scanPeriodMs();
        long silentMs = now - seen.lastGoodMs();
        UnitTelemetry latest = seen.latest();
        if (silentMs > plan.settings().telemetryLossScans() * scanMs) {
            return Optional.of(String.format(Locale.ROOT, "telemetry lost: no good reading for %.1f s (limit %d scans "
                    + "of %.1f s)", silentMs / 1000.0, plan.settings().telemetryLossScans(), scanMs / 1000.0));
        }
        if (latest.status() != UnitStatus.ONLINE || latest.controlMode() != ControlMode.REMOTE) {
            return Optional.of("unit left online/remote: now " + latest.status().name().toLowerCase(Locale.ROOT) + ", "
                    + latest.controlMode().name().toLowerCase(Locale.ROOT));
        }
        if (programme == null) {
            return Optional.empty();
        }
        double excursion = Math.abs(latest.outputMw() - programme.startMw());
        if (latest.outputQuality().validity() == Validity.GOOD && excursion > caps.maxExcursionMw()) {
            return Optional.of(String.format(Locale.ROOT, "output %.2f MW is %.2f MW from the start, beyond the "
                    + "excursion cap of %.2f MW", latest.outputMw(), excursion, caps.maxExcursionMw()));
        }
        if (now - startedMs > caps.maxDurationS() * 1000) {
            return Optional.of(String.format(Locale.ROOT, "duration cap of %.0f s reached", caps.maxDurationS()));
        }
        return Optional.empty();
    }

    /** Median interval of the last good telemetry scans; 1 s until three intervals are known. */
    long scanPeriodMs() {
        return ScanPeriod.medianMs(telemetry, DEFAULT_SCAN_MS);
    }

    private void send(TimedPulse p, int stepIndex, long now) {
        long seq = nextSeq++;
        UnitCommand unsigned = UnitCommand.pulse(seq, now, unitId, CONTROLLER_ID, epoch,
                now + plan.settings().commandValidityMs(), p.direction(), p.durationMs());
        UnitCommand c = signer == null ? unsigned : signer.sign(unsigned);
        long expiryS = Math.max(1, (plan.settings().commandValidityMs() + 999) / 1000);
        sent.add(new SentPulse(seq, now, stepIndex, p.direction(), p.durationMs()));
        requestedMw += (p.direction() == PulseDirection.RAISE ? 1 : -1) * declaration.pulseRateMwPerMin()
                * p.durationMs() / 60_000.0;
        bus.publish(new OutboundMessage(topics.unitCommand(unitId), codec.encode(c), Qos.AT_LEAST_ONCE, false, expiryS))
                .exceptionally(e -> {
                    synchronized (notes) {
                        notes.add("command seq " + seq + " was not delivered to the broker: " + e.getMessage());
                    }
                    return null;
                });
    }

    private void stop(RunState end, String reason, long now) {
        state = end;
        stopReason = reason;
        stoppedMs = now;
    }

    /** @return true once the run finished, was aborted or refused */
    public boolean isDone() {
        return state == RunState.FINISHED || state == RunState.ABORTED || state == RunState.REFUSED;
    }

    /** @return current state */
    public RunState state() {
        return state;
    }

    /**
     * Stops the run from another thread (e.g. a shutdown hook): the agent thread stops at its next
     * cycle and sends nothing further; {@link #record()} also honours it when the agent no longer runs.
     */
    public void abortNow(String reason) {
        externalAbort = reason;
    }

    /** @return the latest progress snapshot (any thread), or null before the first cycle */
    public PulseTestProgress progress() {
        return progress;
    }

    private void publishProgress(long now) {
        progress = PulseTestProgress.of(state, sequencer == null ? null : sequencer.current(),
                sequencer != null && now >= sequencer.nominalEndMs(), sequencer == null ? 0 : sequencer.stepNumber(),
                programme == null ? 0 : programme.steps().size(), (now - startedMs) / 1000.0,
                seen.lastPoint(), requestedMw);
    }

    /** @return what the run recorded so far (final once {@link #isDone()}) */
    public PulseTestRecord record() {
        seen.drain();
        if (!isDone() && externalAbort != null) {
            stop(RunState.ABORTED, externalAbort, clock.epochMillis());
        }
        List<String> n;
        synchronized (notes) {
            n = List.copyOf(notes);
        }
        return new PulseTestRecord(unitId, state, stopReason, declaration, programme,
                startedMs, programmeStartMs, stoppedMs < 0 ? clock.epochMillis() : stoppedMs, telemetry, frequency,
                sequencer == null ? List.of() : sequencer.timings(), governor, sent, seen.acks(), n);
    }

    @Override
    public void onClose() {
        bus.unsubscribe(topics.unitTelemetry(unitId));
        bus.unsubscribe(topics.unitAck(unitId));
    }

    @Override
    public String roleName() {
        return "pulse-test-" + unitId;
    }
}
