package org.loopstand.plant.unit;

import java.util.Map;

import org.loopstand.plant.fault.CommandOutcomeListener;
import org.loopstand.plant.fault.PlantFaultFlags;
import org.loopstand.plant.field.TurbineField;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.security.CommandVerifier;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.security.VerificationResult;
import org.loopstand.protocol.time.Clock;

/**
 * One unit's plant interface, the part a control centre talks to: takes commands through the
 * {@link CommandGate}, answers them through {@link CommandAnswers}, moves the load reference with a
 * {@link LoadReferenceMotion}, keeps the control mode, runs the heartbeat watchdog and publishes
 * telemetry on its scan period ({@link TelemetryScanSchedule}). Pure logic on an
 * injected clock: no bus, no threads. One owner thread calls every method; only the counters are
 * safe to read from other threads.
 *
 * <p>Watchdog ({@link StatusHeartbeat}): when no live status has come for {@code watchdogS} or the
 * controller reports itself offline, a unit in remote leaves remote (mode becomes local) and holds its
 * load reference or returns to its base point; back to remote only on an order ({@link #setControlMode}).
 */
public final class UnitPlantInterface {
    private final UnitSettings settings;
    private final TurbineField field;
    private final Clock clock;
    private final UnitOutput output;
    private final PlantJournal journal;
    private final CommandGate gate;
    private final CommandLatency latency = new CommandLatency();
    private final CommandAnswers answers;
    private final TelemetryScanSchedule scans;
    private LoadReferenceMotion motion;
    private ControlMode mode = ControlMode.REMOTE;
    /** telemetry and acks each count their own seq, so the controller can reckon loss per kind */
    private long seq;
    private long lastTickNanos;
    private final StatusHeartbeat heartbeat = new StatusHeartbeat();
    private final IntakeOverflowReport overflow;
    private PlantFaultFlags faults = PlantFaultFlags.NONE;
    private CommandOutcomeListener outcomes = CommandOutcomeListener.NONE;
    private boolean localByFault;
    private CommandVerifier verifier;
    private final StatusCheck statusCheck;

    /**
     * @param seqStart first seq of each message kind this interface publishes (telemetry and acks
     *                 count separately; use the start time in epoch ms so a restarted interface keeps
     *                 counting upward)
     */
    public UnitPlantInterface(UnitSettings settings, TurbineField field, Clock clock, UnitOutput output,
                              PlantJournal journal, long seqStart) {
        this.settings = settings;
        this.field = field;
        this.clock = clock;
        this.output = output;
        this.journal = journal;
        this.gate = new CommandGate(settings);
        this.statusCheck = new StatusCheck(settings, gate.tenure(), journal);
        this.seq = seqStart;
        this.answers = new CommandAnswers(settings.unitId(), output, journal, seqStart);
        this.overflow = new IntakeOverflowReport(settings.unitId(), journal);
        long now = clock.monotonicNanos();
        this.lastTickNanos = now;
        this.scans = new TelemetryScanSchedule(settings.telemetryScanMs(), now);
    }

    /**
     * Moves the first telemetry scan {@code phaseNanos} (modulo the scan period) later, so that many
     * units do not all publish in the same instant. Real field devices are not synchronized; a site of
     * thousands of units started together would otherwise send every scan as one burst.
     *
     * @param phaseNanos ≥ 0, ns
     */
    public void staggerTelemetry(long phaseNanos) {
        scans.stagger(lastTickNanos, phaseNanos);
    }

    public String unitId() {
        return settings.unitId();
    }

    public UnitSettings settings() {
        return settings;
    }

    /** Makes this unit misbehave as its plant faults say (read on every command and tick). */
    public void setFaultFlags(PlantFaultFlags flags) {
        this.faults = flags;
    }

    /** Tells {@code listener} what became of every command (for the checks' run record). */
    public void setCommandListener(CommandOutcomeListener listener) {
        this.outcomes = listener;
    }

    /**
     * Requires every command to be signed and fresh: the verifier's checks (signature, key, expiry,
     * replay) run before every other command rule, so a forged or replayed command never touches the
     * gate's seq history or the load reference. Without a verifier (insecure demo) signatures are not
     * looked at. Call before the first command; one verifier (one replay memory) per process.
     */
    public UnitPlantInterface verifyCommandsWith(CommandVerifier commandVerifier) {
        this.verifier = commandVerifier;
        return this;
    }

    /** @return whether commands must be signed (a verifier is set) */
    public boolean verifiesCommands() {
        return verifier != null;
    }

    /** Handles a command as received; {@code receivedNanos} on this interface's clock. */
    public void onCommand(UnitCommand c, long receivedNanos) {
        // the clock's time, not the physics': validUntil was set on the controller's scenario clock, which
        // follows the plant's clock ticks, and expiry bounds the command's way here, not the data's age
        long nowMs = clock.epochMillis();
        if (verifier != null) {
            VerificationResult v = verifier.verify(settings.unitId(), c);
            if (!v.accepted()) {
                refuse(c, c.seq(), c.controllerId(), new Refusal(v.reason(), v.detail()));
                outcomes.handled(nowMs, c, AckOutcome.REJECTED, v.reason(), false);
                return;
            }
        }
        if (!ensureMotion()) {
            refuse(c, c.seq(), c.controllerId(), new Refusal(RefusalReason.UNIT_OFFLINE, "no field reading from the unit yet"));
            outcomes.handled(nowMs, c, AckOutcome.REJECTED, RefusalReason.UNIT_OFFLINE, false);
            return;
        }
        Refusal r = gate.check(c, nowMs, mode, field.status(), faults.applyExpiredCommands(), clock.monotonicNanos());
        if (r == null && c.kind() == CommandKind.PULSE && motion.headroomMw(c.direction()) <= 0) {
            r = new Refusal(RefusalReason.AT_LIMIT, "load reference target " + motion.targetMw() + " MW is at the "
                    + (c.direction() == PulseDirection.RAISE ? "upper" : "lower") + " regulating limit");
        }
        if (r != null) {
            refuse(c, c.seq(), c.controllerId(), r);
            outcomes.handled(nowMs, c, AckOutcome.REJECTED, r.reason(), false);
            return;
        }
        double targetBeforeMw = motion.targetMw();
        CommandEffect effect = CommandEffect.apply(c, motion, settings, faults);
        latency.accepted(receivedNanos, field.outputMw(), effect.sign());
        answers.accepted(nowMs, c, effect.detail(), targetBeforeMw, motion.targetMw());
        outcomes.handled(nowMs, c, AckOutcome.ACCEPTED, null, effect.acted());
    }

    /** Handles a payload that did not decode as a command (never applied). */
    public void onMalformed(long commandSeq, String controllerId, String detail) {
        refuse(null, commandSeq, controllerId, new Refusal(RefusalReason.MALFORMED, detail));
    }

    /** As {@link #onControllerStatus(ControllerStatus, String, boolean)} for a live status on its own topic. */
    public void onControllerStatus(ControllerStatus s) {
        onControllerStatus(s, s.controllerId());
    }

    /** As {@link #onControllerStatus(ControllerStatus, String, boolean)} for a live status. */
    public void onControllerStatus(ControllerStatus s, String topicControllerId) {
        onControllerStatus(s, topicControllerId, false);
    }

    /**
     * Handles a controller status: heartbeat for the watchdog, epoch for the gate, once it passed
     * every check of {@link StatusCheck}; a refused one is counted and journaled with its reason code
     * ({@code statusRefused}, at most once per code and controller per watchdog period).
     *
     * @param topicControllerId controller id of the topic it arrived on
     * @param retainedCopy      true for the retained copy a subscription brings (not a heartbeat: its epoch
     *                          and an offline state count, but it neither arms nor feeds the watchdog)
     */
    public void onControllerStatus(ControllerStatus s, String topicControllerId, boolean retainedCopy) {
        long nowNanos = clock.monotonicNanos();
        if (!statusCheck.admit(s, topicControllerId, clock.epochMillis(), nowNanos)) {
            return;
        }
        gate.adoptStatusEpoch(s.controllerId(), s.epoch(), nowNanos);
        if (s.state() == ControllerState.OFFLINE) {
            gate.tenure().release(s.controllerId());
            leaveRemote("controller " + s.controllerId() + " reported offline");
            return;
        }
        if (retainedCopy) {
            return;
        }
        heartbeat.beat(nowNanos);
    }

    /**
     * Requires every controller status to be signed with the controller's status key (keys
     * configured); without it statuses are taken unsigned (insecure demo).
     */
    public UnitPlantInterface verifyStatusWith(StatusSeal seal) {
        statusCheck.requireSignatures(seal);
        return this;
    }

    /** @return controller statuses refused so far (any reason) */
    public long statusRefusalCount() {
        return statusCheck.refusals();
    }

    /** @return the controller this unit follows now, or null (owner thread) */
    public String activeController() {
        return gate.tenure().active(clock.monotonicNanos());
    }

    /**
     * @param nowNanos the clock's monotonic reading, ns
     * @return scenario ns since the last controller status while the watchdog is armed and the unit in remote
     *         (what the watchdog counts), else -1
     */
    public long heartbeatAgeNanos(long nowNanos) {
        return mode == ControlMode.REMOTE ? heartbeat.ageNanos(nowNanos) : -1;
    }

    /** Operator order: sets the control mode (the only way back to remote after the watchdog). */
    public void setControlMode(ControlMode newMode, String why) {
        if (newMode == mode) {
            return;
        }
        journal.event(clock.epochMillis(), settings.unitId(), "mode", mode.wireName() + " -> " + newMode.wireName() + ": " + why);
        mode = newMode;
        if (newMode == ControlMode.REMOTE) {
            heartbeat.restart(clock.monotonicNanos()); // a fresh watchdog period from the order on
        } else if (ensureMotion()) {
            motion.hold();
        }
    }

    /**
     * Does what is due at the clock's now: moves the load reference, runs the watchdog, follows the
     * command latency, publishes telemetry when its scan is due.
     *
     * @return 1 when telemetry was published, else 0
     */
    public int tick() {
        long now = clock.monotonicNanos();
        long dt = Math.max(0, now - lastTickNanos);
        lastTickNanos = now;
        followLocalFault();
        dt = Math.round(dt / faults.slowFactor());
        if (ensureMotion()) {
            if (field.status() != UnitStatus.ONLINE) {
                motion.reset(field.loadReferenceMw());
            } else {
                checkWatchdog(now);
                double before = motion.referenceMw();
                double after = motion.advance(dt);
                boolean changed = after != before;
                if (changed) {
                    field.writeLoadReferenceMw(after);
                }
                latency.observe(now, changed, field.outputMw());
            }
        }
        if (scans.takeDue(now)) {
            output.telemetry(telemetry());
            return 1;
        }
        return 0;
    }

    /**
     * @return the telemetry as it would be published now: its {@code sourceTime} is the time of the turbine
     *         reading it carries ({@link TurbineField#readingTimeMs()}: the physics' time, older than the
     *         clock's now while the physics lags), so a controller sees the data's true age; the clock's now
     *         only while the field has no reading yet (the output is then marked invalid anyway)
     */
    public UnitTelemetry telemetry() {
        boolean ready = field.ready();
        Quality q = ready ? Quality.GOOD : Quality.of(Validity.INVALID, QualityFlag.FAILURE);
        double setpoint = motion != null ? motion.referenceMw() : ready ? field.loadReferenceMw() : 0.0;
        long sourceTimeMs = ready ? field.readingTimeMs() : clock.epochMillis();
        return new UnitTelemetry(seq++, sourceTimeMs, settings.unitId(), ready ? field.outputMw() : 0.0, q,
                setpoint, ready ? field.status() : UnitStatus.OFFLINE, mode, settings.regulatingMinMw(),
                settings.regulatingMaxMw(), settings.rampMwPerMin(), settings.pulseRateMwPerMin(),
                settings.acceptsSetpoints(), answers.lastAcceptedSeq());
    }

    /** A switch-to-local plant fault takes the unit out of remote; its end gives remote back. */
    private void followLocalFault() {
        if (faults.forcedLocal() && !localByFault && mode == ControlMode.REMOTE) {
            localByFault = true;
            setControlMode(ControlMode.LOCAL, "plant fault: switched to local at the plant");
        } else if (!faults.forcedLocal() && localByFault) {
            localByFault = false;
            if (mode == ControlMode.LOCAL) {
                setControlMode(ControlMode.REMOTE, "plant fault ended: back to remote");
            }
        }
    }

    private void checkWatchdog(long now) {
        if (mode == ControlMode.REMOTE && heartbeat.overdue(now, settings.watchdogS())) {
            leaveRemote(String.format(java.util.Locale.ROOT, "no controller status for %.1f s (watchdog %.1f s)",
                    heartbeat.ageNanos(now) / 1e9, settings.watchdogS()));
        }
    }

    private void leaveRemote(String why) {
        if (mode != ControlMode.REMOTE) {
            return;
        }
        journal.event(clock.epochMillis(), settings.unitId(), "watchdog", "left remote: " + why);
        mode = ControlMode.LOCAL;
        if (ensureMotion()) {
            if (settings.watchdogAction() == WatchdogAction.BASE_POINT) {
                motion.setpoint(settings.basePointMw());
            } else {
                motion.hold();
            }
        }
    }

    private boolean ensureMotion() {
        if (motion == null && field.ready()) {
            // start from the turbine's own reference: a restarted interface resumes without a jump
            motion = new LoadReferenceMotion(settings, field.loadReferenceMw());
        }
        return motion != null;
    }

    private void refuse(UnitCommand c, long commandSeq, String controllerId, Refusal r) {
        answers.refused(clock.epochMillis(), c, commandSeq, controllerId, r, motion == null ? Double.NaN : motion.targetMw());
    }

    /**
     * Journals commands lost before they reached this interface (intake queue full; no ack is
     * possible), at most once per second of clock time ({@link IntakeOverflowReport}).
     *
     * @param totalLost commands lost since start
     */
    public void reportOverflow(long totalLost) {
        overflow.report(totalLost, clock.monotonicNanos(), clock.epochMillis());
    }

    // ---- readings, safe from any thread unless stated

    public ControlMode controlMode() {
        return mode;
    }

    /** @return current load reference, MW (owner thread), NaN before the first field reading */
    public double loadReferenceMw() {
        return motion == null ? Double.NaN : motion.referenceMw();
    }

    /** @return current load reference target, MW (owner thread) */
    public double targetMw() {
        return motion == null ? Double.NaN : motion.targetMw();
    }

    public long refusalCount(RefusalReason reason) {
        return answers.refusalCount(reason);
    }

    public Map<RefusalReason, Long> refusalCounts() {
        return answers.refusalCounts();
    }

    public long acceptedCount() {
        return answers.acceptedCount();
    }

    public CommandLatency latency() {
        return latency;
    }
}
