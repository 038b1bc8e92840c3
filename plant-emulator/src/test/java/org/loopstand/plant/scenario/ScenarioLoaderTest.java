package org.loopstand.plant.scenario;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.StringReader;
import java.nio.file.Path;
import java.util.Optional;

import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.junit.jupiter.api.Test;

class ScenarioLoaderTest {
    private static final Path CONFIG = Path.of("..", "config");

    private static Grid demo() throws Exception {
        return SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
    }

    @Test
    void shouldLoadTheUnitTripScenarioInTimeOrder() throws Exception {
        Scenario s = ScenarioLoader.load(CONFIG.resolve("scenarios/unit-trip.yaml"), EventTypeRegistry.physics(), demo());
        assertThat(s.siteId()).isEqualTo("demo-site");
        assertThat(s.seed()).isEqualTo(42);
        assertThat(s.events()).extracting(ScenarioEvent::type).containsExactly("loadStep", "unitTrip", "loadRamp");
        assertThat(s.events().get(0)).isEqualTo(new PhysicsEvents.LoadStep(30, "north-basin", 80));
    }

    @Test
    void shouldRefuseAnUnknownEventTypeWithFileAndLine() throws Exception {
        String yaml = "site: demo-site\ndurationS: 10\nevents:\n  - {atS: 1, type: loadStep, area: north-basin, deltaMw: 5}\n"
                + "  - {atS: 2, type: breakerOpen, breaker: b1}\n";
        assertThatThrownBy(() -> ScenarioLoader.load("s.yaml", new StringReader(yaml), EventTypeRegistry.physics(), demo()))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:5:14: unknown event type 'breakerOpen'; known types: [loadStep, loadRamp, unitTrip, setLoadReference, scheduleChange, modeChange]");
    }

    @Test
    void shouldReadTheIntegratorAndRefuseAnUnknownOne() throws Exception {
        String exact = "site: demo-site\ndurationS: 10\nintegrator: exact\n";
        assertThat(ScenarioLoader.load("s.yaml", new StringReader(exact), EventTypeRegistry.physics(), demo()).integrator())
                .isEqualTo(org.loopstand.plant.physics.Integrator.EXACT);
        String wrong = "site: demo-site\ndurationS: 10\nintegrator: euler\n";
        assertThatThrownBy(() -> ScenarioLoader.load("s.yaml", new StringReader(wrong), EventTypeRegistry.physics(), demo()))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:3:1: unknown integrator 'euler'; known: [rk4, exact]");
    }

    @Test
    void shouldRefuseAnEventForAnUnknownUnitAndTheWrongSite() throws Exception {
        String yaml = "site: other-site\ndurationS: 10\nevents:\n  - {atS: 1, type: unitTrip, unit: nowhere-1}\n";
        assertThatThrownBy(() -> ScenarioLoader.load("s.yaml", new StringReader(yaml), EventTypeRegistry.physics(), demo()))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:1:1: the scenario is for site 'other-site' but the site file is 'demo-site'")
                .hasMessageContaining("s.yaml:4:5: unitTrip event: unknown unit 'nowhere-1'");
    }

    @Test
    void shouldNameTheSiteWithSiteIdAsTheSiteFileDoesAndStillTakeTheOldSpelling() throws Exception {
        String now = "durationS: 10\nsiteId: demo-site\n";
        assertThat(ScenarioLoader.load("n.yaml", new StringReader(now), EventTypeRegistry.physics(), demo()).siteId())
                .isEqualTo("demo-site");
        assertThat(ScenarioLoader.load("o.yaml", new StringReader("site: demo-site\ndurationS: 10\n"),
                EventTypeRegistry.physics(), demo()).siteId()).isEqualTo("demo-site");
        assertThatThrownBy(() -> ScenarioLoader.load("w.yaml", new StringReader(now.replace("demo-site", "elsewhere")),
                EventTypeRegistry.physics(), demo()))
                .hasMessage("w.yaml:2:1: the scenario is for site 'elsewhere' but the site file is 'demo-site'");
    }

    @Test
    void shouldAcceptEventTypesRegisteredByOthers() throws Exception {
        EventTypeRegistry registry = EventTypeRegistry.physics();
        registry.register("note", (at, keys) -> new ScenarioEvent() {
            private final String text = keys.requiredString("text");

            @Override
            public double atS() {
                return at;
            }

            @Override
            public String type() {
                return "note:" + text;
            }

            @Override
            public Optional<String> check(Grid grid) {
                return Optional.empty();
            }

            @Override
            public void apply(ScenarioContext context) {
            }
        });
        String yaml = "site: demo-site\ndurationS: 10\nevents:\n  - {atS: 1, type: note, text: hello}\n";
        Scenario s = ScenarioLoader.load("s.yaml", new StringReader(yaml), registry, demo());
        assertThat(s.events()).extracting(ScenarioEvent::type).containsExactly("note:hello");
    }
}
