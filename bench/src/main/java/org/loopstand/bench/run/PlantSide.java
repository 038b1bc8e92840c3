package org.loopstand.bench.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Consumer;
import org.HdrHistogram.Histogram;
import org.loopstand.bench.probe.PublishStamps;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.runtime.PublisherThread;
import org.loopstand.plant.runtime.StepPassMarks;
import org.loopstand.plant.runtime.TelemetryPacing;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.scenario.PhysicsEvents;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.Clock;

/**
 * The plant half of a bench run: the real {@link PlantRunner} on the generated site, its connections
 * wrapped in {@link StampingBus} probes, unit telemetry staggered over its period. Runs in the bench's
 * JVM (layout one-jvm) or in a plant process of its own (layout processes).
 */
final class PlantSide implements AutoCloseable {
    /** Publishes that may wait for the plant's publisher thread (as the plant command's). */
    static final int PUBLISH_QUEUE = 65_536;

    private final List<MqttLink> links = new ArrayList<>();
    private final PlantRunner plant;
    private final GridSimulator sim;
    private final int telemetryBytes;
    private final long connectWaitMs;
    /** the plant's publisher thread, null when it publishes on its physics thread */
    private final PublisherThread publisher;

    /** @param stamps where publishes are stamped, null when the controller runs in another process */
    PlantSide(BenchSettings s, Grid grid, String serverUri, PublishStamps stamps, StampingBus.CommandTally tally,
              Clock clock, Consumer<String> say) {
        this.connectWaitMs = BenchLinks.connectWaitMs(s, 60_000);
        LinkFactory factory = (clientId, will) -> {
            MqttLinkConfig.Builder b = BenchLinks.configure(MqttLinkConfig.builder().serverUri(serverUri).clientId(clientId), s);
            if (will != null) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            MqttLink l = new MqttLink(b.build(), clock);
            links.add(l);
            return new StampingBus(l.start(), stamps, clock, tally);
        };
        // the stamp is taken where the message is handed to the client: on the publisher thread when there is one
        publisher = s.plantPacing() == BenchSettings.PlantPublishing.LOOP ? null
                : new PublisherThread(PUBLISH_QUEUE, clock, "plant-publisher",
                        s.plantPacing() == BenchSettings.PlantPublishing.SPREAD ? TelemetryPacing.SPREAD : TelemetryPacing.BURST);
        List<MeterSettings> meters = new ArrayList<>();
        for (Area a : grid.areas()) {
            meters.add(MeterSettings.defaults(a.id()).withScanPeriodMs(s.meterScanMs()));
        }
        InterfaceOptions iface = InterfaceOptions.defaults().withTelemetryScanMs(s.telemetryScanMs(), Map.of());
        // layout hosts: every unit's interface runs on a unit host, the plant serves their turbines over the field topics
        Set<String> remote = s.layout() == BenchSettings.Layout.HOSTS
                ? grid.units().stream().map(u -> u.id()).collect(java.util.stream.Collectors.toSet()) : Set.of();
        PlantOptions po = new PlantOptions(1.0, remote, s.grouping(), s.poolSize(), meters, iface,
                Qos.AT_MOST_ONCE, 256, 1, 1.0);
        sim = new GridSimulator(grid);
        plant = new PlantRunner(sim, loadSteps(grid, s), po, publisher == null ? factory : publisher.wrap(factory), clock,
                say::accept).unitScanMs(s.unitScanMs()).fieldPeriodMs(s.fieldScanMs())
                .markStepPasses(publisher == null ? StepPassMarks.NONE : publisher);
        List<UnitDutyCycle> hosts = plant.unitCycles();
        long periodNanos = s.telemetryScanMs() * 1_000_000L;
        for (int i = 0; i < hosts.size(); i++) {
            hosts.get(i).unit().staggerTelemetry(i * periodNanos / hosts.size());
        }
        telemetryBytes = hosts.isEmpty() ? 0 : new MessageCodec().encode(hosts.get(0).unit().telemetry()).length;
    }

    /**
     * Load steps in the first area so that the controller has something to regulate (the generated
     * site starts balanced and would sit in the quiet band, sending nothing): ± the given MW at
     * 5 s of scenario time and then every 60 s with alternating sign, for the whole run.
     */
    private static List<ScenarioEvent> loadSteps(Grid grid, BenchSettings s) {
        List<ScenarioEvent> out = new ArrayList<>();
        if (s.loadStepMw() == 0) {
            return out;
        }
        String area = grid.areas().get(0).id();
        double sign = 1;
        for (double t = 5; t < s.warmupS() + s.durationS() + 60; t += 60, sign = -sign) {
            out.add(new PhysicsEvents.LoadStep(t, area, sign * s.loadStepMw()));
        }
        return out;
    }

    void awaitConnected() throws InterruptedException {
        for (MqttLink l : links) {
            if (!l.awaitConnected(connectWaitMs)) {
                throw new IllegalStateException("plant link " + l.clientId() + " did not connect");
            }
        }
    }

    void start() {
        plant.start();
    }

    int connections() {
        return links.size();
    }

    int telemetryBytes() {
        return telemetryBytes;
    }

    /** @return the physics step, s: the period of the plant's publish bursts */
    double stepS() {
        return sim.stepS();
    }

    Histogram latenessUs() {
        return plant.lateness().histogramUs();
    }

    Throwable failure() {
        return plant.failure();
    }

    /** @return what the publisher thread's spread did, or a note that there is none */
    String spreadFigures() {
        if (publisher == null) {
            return "plant publishes on its physics thread";
        }
        PublisherThread.SpreadCounts c = publisher.spreadCounts();
        return "plant publisher thread: " + publisher.published() + " published, " + publisher.refusedFull()
                + " refused (queue full)" + (c == null ? "" : "; step telemetry: " + c);
    }

    BusCounters counters() {
        BusCounters c = new BusCounters();
        links.forEach(l -> c.addAll(l.counters()));
        return c;
    }

    @Override
    public void close() {
        plant.close();
    }
}
