package org.loopstand.plant.scenario;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.io.StringReader;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.RehearsalStudy;
import org.loopstand.plant.study.StudyPlant;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.topic.TopicTree;

/** scheduleChange and modeChange in a study run with the plant on the in-memory bus (no controller). */
class PlantEventsTest {
    private static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    private static final String SCENARIO = """
            site: demo-site
            durationS: 60
            seed: 9
            startHourOfDay: 10
            events:
              - {atS: 10, type: scheduleChange, area: north-basin, scheduledNetInterchangeMw: 150, scheduledFrequencyHz: 50.02}
              - {atS: 20, type: modeChange, unit: basin-gas-1, mode: local}
            checks:
              - {name: freq, type: frequencyRestored, area: north-basin, afterS: 30, withinS: 20, bandMhz: 10}
            """;

    private final MessageCodec codec = new MessageCodec();
    private final TopicTree topics = TopicTree.forSite("demo-site");

    @Test
    void shouldPublishTheScheduleRetainedPutTheUnitInLocalAndJudgeFrequencyAgainstTheSchedule() throws Exception {
        Grid grid = SiteLoader.load(SITE);
        RunScenario rs = RunScenarioLoader.load("events.yaml", new StringReader(SCENARIO), EventTypeRegistry.physics(), grid);
        InMemoryBroker[] broker = new InMemoryBroker[1];
        List<UnitTelemetry> gasTelemetry = new ArrayList<>();
        RehearsalStudy.Result r = new RehearsalStudy(grid, rs, 1.0, c -> {
            broker[0] = new InMemoryBroker(c.clock(), DeliveryMode.DIRECT);
            StudyPlant plant = StudyPlant.on(c, broker[0], StudyPlant.defaultOptions(c), false);
            InMemoryBus tester = broker[0].connect("tester");
            tester.subscribe(topics.unitTelemetry("basin-gas-1"), Qos.AT_MOST_ONCE, m -> {
                if (codec.decode(m.payload(), UnitTelemetry.class) instanceof Decoded.Ok<UnitTelemetry> ok) {
                    gasTelemetry.add(ok.value());
                }
            });
            Agent pulser = new Agent() {
                private boolean sent;

                @Override
                public int doWork() {
                    if (!sent && c.faults().nowS() >= 30) {
                        long now = c.clock().epochMillis();
                        UnitCommand cmd = UnitCommand.pulse(1, now, "basin-gas-1", "controller-1", 1, now + 4000,
                                PulseDirection.RAISE, 1000);
                        tester.publish(OutboundMessage.of(topics.unitCommand("basin-gas-1"), codec.encode(cmd), Qos.AT_LEAST_ONCE));
                        sent = true;
                    }
                    return 0;
                }

                @Override
                public String roleName() {
                    return "pulser";
                }
            };
            return List.of(plant, pulser);
        }, FaultObserver.NONE).run();

        Schedule s = ((Decoded.Ok<Schedule>) codec.decode(broker[0].retained(topics.areaSchedule("north-basin")).orElseThrow()
                .payload(), Schedule.class)).value();
        assertThat(s.scheduledNetInterchangeMw()).isEqualTo(150);
        assertThat(s.scheduledFrequencyHz()).isEqualTo(50.02);
        assertThat(s.effectiveFrom()).isEqualTo(RehearsalStudy.START_EPOCH_MS + 10_000);
        assertThat(r.record().scheduleAt("north-basin", 9.9)).isNull();
        assertThat(r.record().scheduleAt("north-basin", 10).scheduledFrequencyHz()).isEqualTo(50.02);

        // the unit left remote at 20 s: telemetry says local, and the pulse at 30 s is refused notInRemote
        assertThat(gasTelemetry).filteredOn(t -> t.sourceTime() < RehearsalStudy.START_EPOCH_MS + 20_000).isNotEmpty()
                .allSatisfy(t -> assertThat(t.controlMode()).isEqualTo(ControlMode.REMOTE));
        assertThat(gasTelemetry).filteredOn(t -> t.sourceTime() > RehearsalStudy.START_EPOCH_MS + 20_000).isNotEmpty()
                .allSatisfy(t -> assertThat(t.controlMode()).isEqualTo(ControlMode.LOCAL));
        assertThat(r.record().commands()).singleElement()
                .satisfies(c -> assertThat(c.reason()).isEqualTo(RefusalReason.NOT_IN_REMOTE));

        // no secondary control: frequency stays near 50 Hz, 20 mHz below the new schedule, so ±10 mHz of it fails
        CheckOutcome freq = r.outcome("freq");
        assertThat(freq.passed()).isFalse();
        assertThat(freq.detail()).contains("of its schedule");
        RunRecord.Series f = r.record().series("frequencyHz/north-basin");
        // the loads' noise (σ 6 and 4 MW over β ≈ 1700 MW/Hz) keeps it within about 15 mHz of 50 Hz, ≥ 5 mHz off the band
        assertThat(f.value(f.size() - 1)).isCloseTo(50.0, within(0.015));
    }

    @Test
    void shouldRefuseAnUnknownModeAndAScheduledFrequencyOutOfRange() throws Exception {
        Grid grid = SiteLoader.load(SITE);
        String bad = """
                site: demo-site
                durationS: 60
                events:
                  - {atS: 10, type: modeChange, unit: basin-gas-1, mode: manual}
                  - {atS: 20, type: scheduleChange, area: north-basin, scheduledNetInterchangeMw: 0, scheduledFrequencyHz: 80}
                """;
        assertThatThrownBy(() -> RunScenarioLoader.load("bad.yaml", new StringReader(bad), EventTypeRegistry.physics(), grid))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("mode").hasMessageContaining("must be remote, local or off, got 'manual'")
                .hasMessageContaining("scheduledFrequencyHz must be in [40, 70] Hz, got 80");
    }
}
