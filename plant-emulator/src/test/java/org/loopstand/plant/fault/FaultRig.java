package org.loopstand.plant.fault;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The demo site's physics with a meter of north-basin and the telemetry of basin-gas-1 published
 * through the fault stage every scan. Truth records are built from the simulator the way a plain
 * meter would; what reached the bus is decoded back.
 */
final class FaultRig {
    static final long START_MS = 1_767_225_600_000L;
    static final String AREA = "north-basin";
    static final String METER = "nb-meter-1";
    static final String UNIT = "basin-gas-1";
    static final String TIE = "basin-ridge";

    final Grid grid;
    final GridSimulator sim;
    final VirtualClock clock = new VirtualClock(START_MS);
    final TargetCatalog catalog;
    final List<Publication> publications = new ArrayList<>();
    final List<String> transitions = new ArrayList<>();
    final FaultEngine engine;
    final RecordingBus bus = new RecordingBus();
    final FaultyPublisher publisher;
    final MessageCodec codec = new MessageCodec();
    final List<AreaMeter> truthMeters = new ArrayList<>();
    private long seq;

    FaultRig() {
        try {
            grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
        sim = new GridSimulator(grid, 0.02, 5, 10.0);
        sim.stepLoadMw(AREA, 40); // something to move the truth
        catalog = TargetCatalog.of(grid);
        FaultObserver recorder = new FaultObserver() {
            @Override
            public void published(long tMs, Publication p) {
                publications.add(p);
            }

            @Override
            public void faultStarted(long tMs, FaultSpec spec, String source) {
                transitions.add("start " + spec.id() + " at " + (tMs - START_MS));
            }

            @Override
            public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
                transitions.add("stop " + spec.id() + " at " + (tMs - START_MS));
            }
        };
        engine = new FaultEngine(clock, START_MS, recorder);
        publisher = new FaultyPublisher(TargetCatalog.PLANT_CONNECTION, bus, TopicTree.forSite(grid.siteId()), codec, engine,
                catalog, recorder, clock, Qos.AT_MOST_ONCE, 11, 100);
    }

    FaultSpec fault(String id, String type, String target, Map<String, ?> params, double startS, double endS) {
        FaultSpec spec = FaultSpec.builder(FaultLibrary.standard(), catalog).id(id).type(type).target(target)
                .parameters(params).window(startS, endS).build();
        engine.schedule(spec).ifPresent(r -> {
            throw new IllegalStateException(r);
        });
        return spec;
    }

    /** Runs {@code scans} meter and telemetry scans, {@code periodMs} apart, the first at the current time. */
    void run(int scans, long periodMs) {
        for (int i = 0; i < scans; i++) {
            engine.update();
            publisher.doWork();
            AreaMeter truth = truthMeter();
            truthMeters.add(truth);
            publisher.publishMeter(truth);
            publisher.publishTelemetry(truthTelemetry());
            clock.advanceMillis(periodMs);
            sim.advanceTo((clock.epochMillis() - START_MS) / 1000.0);
        }
        engine.update();
        publisher.doWork();
    }

    AreaMeter truthMeter() {
        int a = grid.areaIndex(AREA);
        return new AreaMeter(++seq, clock.epochMillis(), AREA, METER, sim.frequencyHz(a), Quality.GOOD,
                List.of(new TieFlow(TIE, sim.tieFlowMw(TIE), Quality.GOOD)), sim.netInterchangeMw(a), Quality.GOOD);
    }

    UnitTelemetry truthTelemetry() {
        return new UnitTelemetry(seq, clock.epochMillis(), UNIT, sim.outputMw(UNIT), Quality.GOOD, sim.loadReferenceMw(UNIT),
                UnitStatus.ONLINE, ControlMode.REMOTE, 150, 600, 30, 30, false, 0);
    }

    /** @return the meter messages that reached the bus, decoded, in bus order */
    List<AreaMeter> sentMeters() {
        return decodeAll(AreaMeter.class, "/meter/");
    }

    List<UnitTelemetry> sentTelemetry() {
        return decodeAll(UnitTelemetry.class, "/telemetry");
    }

    private <T> List<T> decodeAll(Class<T> type, String topicPart) {
        List<T> out = new ArrayList<>();
        bus.sent.stream().filter(m -> m.topic().contains(topicPart)).forEach(m -> {
            Decoded<T> d = codec.decode(m.payload(), type);
            if (d instanceof Decoded.Ok<T> ok) {
                out.add(ok.value());
            } else {
                throw new IllegalStateException("published payload does not decode: " + d);
            }
        });
        return out;
    }

    /** @return the meter publications as the observer saw them (truth beside published) */
    List<Publication> meterPublications() {
        return publications.stream().filter(p -> p.stream().startsWith("meter/")).toList();
    }
}
