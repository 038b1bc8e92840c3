package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentLinkedQueue;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.SiteArea;
import org.loopstand.controller.intake.AreaCycleInputs;
import org.loopstand.controller.cycle.ControlCycle;
import org.loopstand.controller.cycle.ControlCycleSettings;
import org.loopstand.controller.cycle.CycleInputs;
import org.loopstand.controller.cycle.CycleOutcome;
import org.loopstand.controller.cycle.CycleScheduler;
import org.loopstand.controller.cycle.CycleTick;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.controller.intake.IntakeRouter;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.safety.InterlockState;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.ClockSilenceWatch;
import org.loopstand.protocol.topic.TopicTree;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The controller as a process on the bus. On every tick of its {@link CycleScheduler} (fixed rate,
 * no drift) it builds the cycle inputs from the {@link IntakeRouter}, runs {@link ControlCycle#step},
 * publishes the planned commands as {@link UnitCommand}s (QoS 1, MQTT expiry from validUntil) and a
 * retained {@link ControllerStatus}, journals the decision and records the cycle start jitter. The
 * journal also holds every input routed and the cycle timing, so that a run replays exactly (docs/replay.md).
 *
 * <p>Bus link: a {@link ConnectionListener} keeps {@code linkUp}; while it is down the cycle's
 * interlock suspends ({@code busLinkDown}) and nothing at all is published. Not thread-safe: one
 * runner thread calls {@link #doWork()} (or a test after advancing a virtual clock).
 */
public final class ControllerAgent implements Agent {
    private static final Logger LOG = LoggerFactory.getLogger(ControllerAgent.class);
    /** Jitter tag in the histogram log, µs. */
    public static final String JITTER_TAG = "cycleStartJitterUs";

    private final ControllerSiteConfig site;
    private final MessageBus bus;
    private final Clock clock;
    private final BusClock busClock;
    private final String controllerId;
    private final long epoch;
    private final JournalWriter journal;
    private final HistogramLogs histograms;
    private final ControllerMetrics metrics = new ControllerMetrics();
    private final TopicTree topics;
    private final MessageCodec codec = new MessageCodec();
    private final IntakeRouter intake;
    private final ControlCycle cycle;
    private final CommandOutcomes outcomes;
    private final InputUseJournal inputUse;
    private final ConcurrentLinkedQueue<String> publishFailures = new ConcurrentLinkedQueue<>();
    private final ConcurrentLinkedQueue<Map<String, Object>> journalEvents = new ConcurrentLinkedQueue<>();
    private final ExclusionList excluded = new ExclusionList();
    private final SentCommands sentCommands;
    private final CommandSender sender;
    private final StatusPublisher status;
    private final AreaSuspensionJournal areaSuspensions;
    private final ClockSilenceWatch clockSilence;
    private volatile boolean linkUp;
    private CycleScheduler scheduler;
    private CycleOutcome lastOutcome;
    private long lastHeartbeatWallNanos;
    private long cyclesRun;

    /**
     * @param site         the controller's site configuration
     * @param bus          the bus (MQTT link or in-memory); its last will should be this
     *                     controller's offline status ({@link OfflineStatus#will})
     * @param clock        the controller's clock (wall, accelerated, virtual, or {@code busClock})
     * @param busClock     when following the plant's clock: the same object as {@code clock}, fed
     *                     from clock ticks; cycles wait for its first tick. Null otherwise
     * @param controllerId controller id (id pattern)
     * @param epoch        controller epoch, ≥ 0 (the start time in epoch ms by convention)
     * @param journal      run journal, or null for none; owned and closed by this agent
     * @param histograms   histogram log for the cycle jitter, or null; owned and closed by this agent
     */
    public ControllerAgent(ControllerSiteConfig site, MessageBus bus, Clock clock, BusClock busClock,
                           String controllerId, long epoch, JournalWriter journal, HistogramLogs histograms) {
        if (busClock != null && busClock != clock) {
            throw new IllegalArgumentException("busClock must be the agent's clock when given");
        }
        this.site = site;
        this.bus = bus;
        this.clock = clock;
        this.busClock = busClock;
        this.controllerId = controllerId;
        this.epoch = epoch;
        this.journal = journal;
        this.histograms = histograms;
        metrics.attach(this);
        this.topics = TopicTree.forSite(site.siteId());
        this.cycle = new ControlCycle(ControlCycleSettings.fromSite(site));

        this.sentCommands = new SentCommands(controllerId, journal);
        this.outcomes = new CommandOutcomes(cycle, sentCommands);
        this.intake = new IntakeRouter(site, clock, codec,
                new IntakeJournal(clock, journal, sentCommands, outcomes, this::countRejected, this::countRouted));
        this.inputUse = new InputUseJournal(site, intake);
        this.sender = new CommandSender(bus, topics, codec, controllerId, epoch, sentCommands, outcomes, journal, metrics,
                publishFailures);
        this.status = new StatusPublisher(bus, clock, topics, codec, controllerId, epoch, publishFailures);
        this.areaSuspensions = new AreaSuspensionJournal(intake, journal);
        if (busClock != null) {
            intake.onClockTick(busClock::onTick);
        }
        this.clockSilence = busClock == null ? null : new ClockSilenceWatch(busClock, journalEvents::add);
    }

    /**
     * Signs every command from now on (HMAC with the target unit's current key). Without a signer
     * commands go out unsigned, which only an insecure demo unit accepts. Call before {@link #onStart}.
     */
    public ControllerAgent signCommandsWith(CommandSigner commandSigner) {
        sender.signWith(commandSigner);
        return this;
    }

    /**
     * Signs every status from now on with the controller's status key (keys configured), so units
     * that hold that key take no unsigned or forged status. Call before {@link #onStart}.
     */
    public ControllerAgent signStatusWith(StatusSeal seal) {
        status.sealWith(seal);
        return this;
    }

    /**
     * @param wake run on a bus thread whenever an input was queued, typically the runner's
     *             {@link org.loopstand.protocol.agent.AgentRunner#wake}, so the intake is drained at
     *             once instead of after the runner's idle park
     */
    public ControllerAgent wakeOnInput(Runnable wake) {
        intake.onArrival(wake);
        return this;
    }

    /** @return commands not sent because no key was valid for their unit */
    public long unsignableCommands() {
        return sender.unsignable();
    }

    @Override
    public void onStart() {
        bus.addConnectionListener(new ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
                linkUp = true;
                if (busClock != null) {
                    busClock.linkUp(true);
                }
                journalEvents.add(Map.of("event", reconnect ? "busReconnected" : "busConnected"));
            }

            @Override
            public void onDisconnected(Throwable cause) {
                linkUp = false;
                if (busClock != null) {
                    busClock.linkUp(false); // no tick can come: the clock runs on blind, cycles suspend for the link
                }
                journalEvents.add(Map.of("event", "busLinkDown", "cause", String.valueOf(cause)));
            }
        });
        for (String filter : intake.subscriptions()) {
            bus.subscribe(filter, Qos.AT_LEAST_ONCE, intake.listener());
        }
        linkUp = bus.isConnected();
        if (linkUp) {
            status.publish(ControllerState.SUSPENDED, List.of("starting"), 0, List.of(), List.of(), List.of());
        }
    }

    /** Wall time between the statuses sent while the controller's clock stands still, ns. */
    static final long STILL_HEARTBEAT_WALL_NANOS = 200_000_000L;

    @Override
    public int doWork() {
        int work = clockSilence == null ? 0 : clockSilence.poll();
        work += drainArrivals();
        work += heartbeatWhileStill();
        if (scheduler == null) {
            if (busClock != null && !busClock.synced()) {
                return work;
            }
            scheduler = CycleScheduler.alignedTo(clock, site.settings().cycleMs() * 1_000_000L);
            if (journal != null) {
                journal.append(clock.epochMillis(), InputEntries.KIND_CYCLE_CLOCK, CycleEntries.cycleClock(scheduler));
            }
        }
        Optional<CycleTick> tick = scheduler.poll();
        if (tick.isPresent()) {
            runCycle(tick.get());
            work++;
        }
        if (journal != null) {
            journal.flushIfDue();
        }
        if (histograms != null) {
            histograms.writeIntervalIfDue();
        }
        return work;
    }

    /**
     * While the plant's clock stands still for this controller (no tick yet, or the last one said
     * held) no cycle runs (at most the one due at the held instant), yet the units' watchdog counts from the go: the plant may have started the
     * scenario and its next tick may be a wall second away (at rate 40, 40 s of scenario time, more
     * than the 30 s watchdog). So the suspended status goes out every {@value #STILL_HEARTBEAT_WALL_NANOS}
     * ns of wall time until the clock runs (docs/controller-contract.md: "also while scenario time stands
     * still"). Reason {@code waitingForClock}.
     */
    private int heartbeatWhileStill() {
        if (busClock == null || busClock.rate() > 0 || !linkUp) {
            return 0;
        }
        long now = busClock.wallNanos();
        if (now - lastHeartbeatWallNanos < STILL_HEARTBEAT_WALL_NANOS) {
            return 0;
        }
        lastHeartbeatWallNanos = now;
        status.publish(ControllerState.SUSPENDED, List.of("waitingForClock"), 0, List.of(), List.of(), List.of());
        return 1;
    }

    /**
     * The first half of {@link #doWork()}: routes every queued input and journals the queued bus link
     * events and publish failures; no cycle runs. Exact replay (docs/replay.md) steps this half apart,
     * one journaled input or event at a time.
     *
     * @return inputs routed
     */
    public int drainArrivals() {
        int work = intake.drain();
        drainEvents();
        return work;
    }

    /** @return ns until the next cycle start (for a runner that waits its own way); 0 if unknown */
    public long nanosUntilNextCycle() {
        return scheduler == null ? 0 : scheduler.nanosUntilNext();
    }

    private void runCycle(CycleTick tick) {
        long startNanos = clock.monotonicNanos();
        long nowMs = clock.epochMillis();
        boolean link = linkUp && bus.isConnected();
        List<AreaCycleInputs> areas = new ArrayList<>();
        for (SiteArea a : site.areas()) {
            areas.add(intake.areaInputs(a.id(), nowMs));
        }
        List<org.loopstand.controller.allocation.UnitState> units = intake.unitStates(nowMs);
        CycleOutcome o = cycle.step(new CycleInputs(tick.cycleNumber(), nowMs, link, areas, units));
        lastOutcome = o;
        cyclesRun++;
        metrics.cycle(o.state().name().toLowerCase(java.util.Locale.ROOT), clock.monotonicNanos() - startNanos,
                tick.jitterNanos());
        if (histograms != null) {
            histograms.record(JITTER_TAG, tick.jitterNanos() / 1000);
        }
        List<AreaAce> aces = StatusPublisher.areaAces(o);
        trackExclusions(o, nowMs);
        areaSuspensions.update(o);
        if (link) {
            for (PlannedCommand c : o.commands()) {
                try {
                    sender.send(c, nowMs);
                } catch (RuntimeException e) {
                    // one command that cannot go out must not take the rest of the cycle's with it
                    publishFailures.add("command to " + c.unitId() + " not sent: " + e);
                }
            }
            ControllerState state = o.state() == InterlockState.REGULATING ? ControllerState.REGULATING
                    : ControllerState.SUSPENDED;
            status.publish(state, clockSilence == null ? o.reasons() : clockSilence.withSilence(o.reasons()),
                    tick.cycleNumber(), aces, excluded.units(),
                    AreaSuspensionJournal.forStatus(o));
        }
        if (journal != null) {
            journal.append(nowMs, JournalFormat.KIND_DECIDED, CycleEntries.decided(tick, o, aces, link,
                    inputUse.used(areas, units, nowMs), inputUse.counters()));
        }
    }

    /**
     * Journals every exclusion, probe and re-admission of the cycle (event with unit, area, reason
     * and figures) and keeps the list the status shows.
     */
    private void trackExclusions(CycleOutcome o, long nowMs) {
        for (FollowingDecision d : o.decisions()) {
            LOG.info("{} {} ({}): {}", d.event(), d.unitId(), d.areaId(), d.reason());
            if (journal != null) {
                journal.append(nowMs, JournalFormat.KIND_EVENT, d.journalFields());
            }
        }
        excluded.update(o);
    }

    private void drainEvents() {
        outcomes.drain();
        String failure;
        while ((failure = publishFailures.poll()) != null) {
            LOG.warn("publish failed: {}", failure);
            if (journal != null) {
                journal.append(clock.epochMillis(), JournalFormat.KIND_REFUSED, Map.of("publishFailed", failure));
            }
        }
        Map<String, Object> ev;
        while ((ev = journalEvents.poll()) != null) {
            LOG.info("bus: {}", ev);
            if (journal != null) {
                journal.append(clock.epochMillis(), JournalFormat.KIND_EVENT, ev);
            }
        }
    }

    @Override
    public void onClose() {
        // OFF goes out first: stopping on an error (a journal that cannot be written) must not leave a
        // retained "regulating" for the units to find out about only by their watchdog
        if (linkUp && bus.isConnected()) {
            status.publish(ControllerState.OFF, List.of("stopped"), lastOutcome == null ? 0 : lastOutcome.cycleNumber(),
                    List.of(), List.of(), List.of());
        }
        try {
            drainEvents();
            if (journal != null && !journal.isClosed()) {
                long nowMs = clock.epochMillis(); // one reading: summary and end at the same instant, as a replay writes them
                journal.append(nowMs, JournalFormat.KIND_EVENT, Map.of("event", "summary",
                        "cycles", cyclesRun, "commandsSent", sender.commandsSent(),
                        "areaSuspensions", areaSuspensions.suspensions(), "rejected", intake.rejectedByReason(),
                        "acks", intake.acksByOutcome(), "cyclesMissed", scheduler == null ? 0 : scheduler.cyclesMissed()));
                journal.close(nowMs, EndReason.STOPPED);
            }
        } catch (RuntimeException e) {
            LOG.error("controller journal could not be closed: {}", e.toString());
        }
        if (histograms != null) {
            histograms.close();
        }
    }

    @Override
    public String roleName() {
        return "controller-" + controllerId;
    }

    private void countRejected(String topic) {
        inputUse.onRejected(topic);
    }

    private void countRouted(String topic) {
        inputUse.onRouted(topic);
    }

    // ---- for tests and the CLI

    /** @return acks that answered a command this controller sent */
    public long acksMatched() { return sentCommands.matchedCount(); }
    /** @return acks that answered no command this controller sent (counted apart, never as received) */
    public long acksUnknown() { return sentCommands.unknownCount(); }

    public CycleOutcome lastOutcome() { return lastOutcome; }
    public IntakeRouter intake() { return intake; }
    public ControlCycle cycle() { return cycle; }
    public long commandsSent() { return sender.commandsSent(); }
    /** @return the counters behind {@code control --metrics-port} (readable from any thread) */
    public ControllerMetrics metrics() { return metrics; }
    public long statusesSent() { return status.statusesSent(); }
    public long cyclesRun() { return cyclesRun; }
    public boolean linkUp() { return linkUp; }
    public String controllerId() { return controllerId; }
}
