package org.loopstand.bench.run;

import org.loopstand.controller.runtime.OfflineStatus;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.loopstand.bench.probe.CommandCountingBus;
import org.loopstand.bench.probe.PublishStamps;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.bus.mqtt.SharedSubscriptionBus;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.time.Clock;

/**
 * The controller half of a bench run: the real {@link ControllerAgent} over a
 * {@link SharedSubscriptionBus} of the intake connections, its commands and acks counted, its cycle
 * start jitter in {@code controller.hlog}. Runs in the bench's JVM (layout one-jvm) or in a controller
 * process of its own (layout processes).
 */
final class ControllerSide {
    static final String CONTROLLER_ID = "controller-1";

    private final List<MqttLink> links = new ArrayList<>();
    private final SharedSubscriptionBus shared;
    private final MessageBus bus;
    private final ControllerAgent agent;
    private final ProbedController probed;
    private final AgentRunner runner;
    private final ControllerSiteConfig site;
    private final long connectWaitMs;

    /** @param stamps told of every routed message, null when the plant runs in another process */
    ControllerSide(BenchSettings s, ControllerSiteConfig site, String siteId, String serverUri, PublishStamps stamps,
                   StampingBus.CommandTally tally, Clock clock, Path hlogFile) throws IOException {
        this.connectWaitMs = BenchLinks.connectWaitMs(s, 20_000);
        this.site = site;
        long epoch = clock.epochMillis();
        OutboundMessage will = OfflineStatus.will(siteId, CONTROLLER_ID, epoch, epoch);
        for (int k = 0; k < s.intakeConnections(); k++) {
            MqttLinkConfig.Builder b = BenchLinks.configure(MqttLinkConfig.builder().serverUri(serverUri), s)
                    .clientId(CONTROLLER_ID + "-in" + k).receiveQueueCapacity(100_000);
            if (k == 0) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            links.add(new MqttLink(b.build(), clock));
        }
        shared = new SharedSubscriptionBus(links, "ctl",
                f -> f.endsWith("/telemetry") || f.endsWith("/ack") || f.contains("/meter/"));
        bus = new CommandCountingBus(shared, tally);
        // intervals of two cycles: the measured window starts within two cycles of its mark
        HistogramLogs hlog = HistogramLogs.create(hlogFile, clock, 60_000_000L, 3, 2_000L * s.cycleS());
        agent = new ControllerAgent(site, bus, clock, null, CONTROLLER_ID, epoch, null, hlog);
        if (stamps != null) {
            agent.intake().setRouteProbe(stamps::routed);
        }
        probed = new ProbedController(agent, site.areas(), clock);
        runner = new AgentRunner(probed, 1_000_000L);
        if (s.wakeOnInput()) {
            agent.wakeOnInput(runner::wake);
        }
    }

    /**
     * Starts the cycles, then the links one after the other (the first connect subscribes all), and waits for them.
     * One after the other: the intake links subscribe the same shared subscriptions, and an Artemis node that gets
     * two such SUBSCRIBEs at once fails one of them (AMQ229019 "queue already exists", disconnect 131); that link then
     * goes on to the next node of its list, and the shared subscription's members sit on two nodes, which reorders
     * each unit's telemetry (docs/performance.md).
     */
    void start() throws InterruptedException {
        runner.start();
        for (MqttLink l : links) {
            BenchLinks.startAndAwait(java.util.List.of(l), connectWaitMs, "controller");
        }
    }

    /**
     * Call after {@link #stopCycles()} (the trackers belong to the cycle's thread).
     *
     * @return unit telemetry and area meter messages taken in sequence and missing by sequence number (gaps), per
     *         kind, since start: {@code telemetryTaken}, {@code telemetryMissing}, {@code metersTaken}, {@code metersMissing}
     */
    java.util.Map<String, Long> inputSeqCounts() {
        long[] t = new long[6];
        for (var u : site.units()) {
            var v = agent.intake().telemetryCheck(u.id());
            if (v != null) {
                t[0] += v.seqTracker().takenCount();
                t[1] += v.seqTracker().missingCount();
                t[4] += v.seqTracker().outOfOrderCount();
            }
        }
        for (var a : site.areas()) {
            var f = agent.intake().frequencyInput(a.id());
            for (var v : java.util.Arrays.asList(f.primary(), f.alternate())) {
                if (v != null) {
                    t[2] += v.seqTracker().takenCount();
                    t[3] += v.seqTracker().missingCount();
                    t[5] += v.seqTracker().outOfOrderCount();
                }
            }
        }
        return java.util.Map.of("telemetryTaken", t[0], "telemetryMissing", t[1], "metersTaken", t[2], "metersMissing", t[3],
                "telemetryOutOfOrder", t[4], "metersOutOfOrder", t[5]);
    }

    ControllerAgent agent() {
        return agent;
    }

    ProbedController probed() {
        return probed;
    }

    boolean isRunning() {
        return runner.isRunning();
    }

    /** Stops the cycles; the links stay up so that the last commands' acks still come back. */
    void stopCycles() {
        runner.close();
    }

    BusCounters counters() {
        return shared.counters();
    }

    void closeBus() {
        bus.close();
    }
}
