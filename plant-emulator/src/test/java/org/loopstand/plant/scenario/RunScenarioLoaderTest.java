package org.loopstand.plant.scenario;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.FaultTarget;
import org.loopstand.plant.fault.TargetKind;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;

class RunScenarioLoaderTest {
    private static final Path CONFIG = Path.of("..", "config");
    private static final String HEAD = "site: demo-site\ndurationS: 600\n";

    private static Grid demo() throws Exception {
        return SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
    }

    private static RunScenario load(String yaml) throws Exception {
        return RunScenarioLoader.load("s.yaml", new StringReader(yaml), EventTypeRegistry.physics(), demo());
    }

    @Test
    void shouldLoadEveryShippedRehearsalScenario() throws Exception {
        List<Path> files;
        try (Stream<Path> s = Files.list(CONFIG.resolve("scenarios"))) {
            files = s.filter(p -> p.getFileName().toString().startsWith("rehearse-")).sorted().toList();
        }
        assertThat(files).hasSize(9); // eight, and rehearse-frequency-hold.yaml
        for (Path f : files) {
            RunScenario r = RunScenarioLoader.load(f, EventTypeRegistry.physics(), demo());
            assertThat(r.checks()).as(f.toString()).isNotEmpty();
        }
    }

    @Test
    void shouldReadFaultsWithTheirParametersAndChecksWithAfterResolved() throws Exception {
        RunScenario r = RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-pulses-expired.yaml"), EventTypeRegistry.physics(), demo());
        FaultSpec f = r.faults().get(0);
        assertThat(f.type().name()).isEqualTo("commandDelay");
        assertThat(f.targets()).containsExactly(new FaultTarget(TargetKind.UNIT, "basin-steam-1"));
        assertThat(f.number("delayMs")).isEqualTo(12000.0);
        assertThat(f.number("jitterMs")).isEqualTo(0.0);
        assertThat(f.startS()).isEqualTo(100.0);
        assertThat(f.endS()).isEqualTo(400.0);
        assertThat(r.rateX()).isEqualTo(10.0);
        RunScenario trip = RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-unit-trip.yaml"), EventTypeRegistry.physics(), demo());
        CheckSpec c = trip.checks().get(0);
        assertThat(c.name()).isEqualTo("frequency-back");
        assertThat(c.number("afterS")).isEqualTo(60.0);
        assertThat(c.type().controllerSide()).isFalse();
    }

    @Test
    void shouldTakeAConnectionFaultOnAUnitIdAsThatUnitsConnection() throws Exception {
        RunScenario r = RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-broker-outage.yaml"), EventTypeRegistry.physics(), demo());
        assertThat(r.faults().get(0).targets()).contains(new FaultTarget(TargetKind.CONNECTION, "plant"),
                new FaultTarget(TargetKind.CONNECTION, "ridge-steam-1"));
    }

    @Test
    void shouldRefuseAnUnknownTargetWithFileAndLine() {
        String yaml = HEAD + "faults:\n  - {id: f1, type: freezeValue, target: west-lake, startS: 10, endS: 20}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:33: fault f1: unknown target 'west-lake' for this fault type");
    }

    @Test
    void shouldRefuseOverlappingContradictoryFaults() {
        String yaml = HEAD + "faults:\n"
                + "  - {id: f1, type: freezeValue, target: north-basin, startS: 10, endS: 100}\n"
                + "  - {id: f2, type: repeatLast, target: north-basin, startS: 50, endS: 150}\n"
                + "  - {id: f3, type: repeatLast, target: south-ridge, startS: 50, endS: 150}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:5:5: fault 'f2' (repeatLast) contradicts fault 'f1' (freezeValue, line 4)")
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(1));
    }

    @Test
    void shouldAcceptTheSameValueFaultOnDifferentPoints() throws Exception {
        String yaml = HEAD + "faults:\n"
                + "  - {id: f1, type: stuckAt, target: north-basin, point: frequency, valueHz: 50, startS: 10, endS: 100}\n"
                + "  - {id: f2, type: stuckAt, target: north-basin, point: basin-ridge, valueMw: 0, startS: 10, endS: 100}\n";
        assertThat(load(yaml).faults()).hasSize(2);
    }

    @Test
    void shouldRefuseTimesPastTheDuration() {
        String yaml = HEAD + "events:\n  - {atS: 700, type: loadStep, area: north-basin, deltaMw: 5}\n"
                + "faults:\n  - {id: f1, type: blackout, target: north-basin, startS: 500, durationS: 200}\n"
                + "checks:\n  - {type: frequencyRestored, area: north-basin, afterS: 100}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:6: atS 700.0 s is not before the run's end (durationS 600.0 s)")
                .hasMessageContaining("s.yaml:6:64: fault f1 ends at 700.0 s, past the run's end (durationS 600.0 s)")
                .hasMessageContaining("s.yaml:8:5: check frequencyRestored: its window ends at 1000.0 s (afterS + withinS)");
    }

    @Test
    void shouldRefuseUnknownCheckTypesParametersAndMoments() {
        String yaml = HEAD + "checks:\n"
                + "  - {type: frequencyFine, area: north-basin}\n"
                + "  - {name: c2, type: frequencyRestored, area: north-basin, after: breakerOpen, withinS: 60}\n"
                + "  - {name: c3, type: tieFlowRestored, tie: basin-ridge, afterS: 10, withinS: 60, bandMhz: 3}\n"
                + "  - {name: c4, type: noPulseWhileStale, area: north-basin}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:6: unknown check type 'frequencyFine'; known types: [frequencyRestored,")
                .hasMessageContaining("s.yaml:5:60: check c2: after 'breakerOpen' is neither an event type of this scenario nor a fault id")
                .hasMessageContaining("s.yaml:6:82: check c3: check type tieFlowRestored has no parameter 'bandMhz'")
                .hasMessageContaining("s.yaml:7:41: check c4: no stale or loss fault of this scenario acts on the meters of north-basin")
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(4));
    }

    @Test
    void shouldNotBlameACheckForTheEventItFollowsWhenThatEventWasRefused() {
        // a typo in the step's key refuses the step; the check after it is not a second problem
        String yaml = HEAD + "events:\n  - {atS: 60, type: loadStep, area: north-basin, deltMw: 60}\n"
                + "checks:\n  - {name: back, type: frequencyRestored, area: north-basin, after: loadStep, withinS: 300}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:5: event is missing 'deltaMw'")
                .hasMessageContaining("unknown key 'deltMw' in event (did you mean 'deltaMw'?)")
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(2));
    }

    @Test
    void shouldNotBlameACheckForTheNegativeTimeOfTheEventItFollows() {
        String yaml = HEAD + "events:\n  - {atS: -5, type: loadStep, area: north-basin, deltaMw: 60}\n"
                + "checks:\n  - {name: back, type: frequencyRestored, area: north-basin, after: loadStep, withinS: 300}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:6: atS must be 0 or more, got -5.0")
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(1));
    }

    @Test
    void shouldRefuseAnUnknownFaultTypeAndABadParameter() {
        String yaml = HEAD + "faults:\n"
                + "  - {id: f1, type: meltdown, target: north-basin, startS: 1, endS: 2}\n"
                + "  - {id: f2, type: delay, target: north-basin, startS: 1, endS: 2, delayMs: -5, delaySeconds: 3}\n"
                + "  - {id: f3, type: signFlip, target: north-basin, point: other-tie, startS: 1, endS: 2}\n";
        assertThatThrownBy(() -> load(yaml)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:14: fault f1: unknown fault type 'meltdown'; known types: [drop,")
                .hasMessageContaining("s.yaml:5:68: fault f2: delayMs must lie in [0, 600000] ms, got -5")
                .hasMessageContaining("s.yaml:5:81: fault f2: fault type delay has no parameter 'delaySeconds'")
                .hasMessageContaining("s.yaml:6:51: fault f3: point 'other-tie' is not frequency, netInterchange or a tie of area north-basin");
    }
}
