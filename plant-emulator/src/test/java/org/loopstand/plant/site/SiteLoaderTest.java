package org.loopstand.plant.site;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.io.StringReader;
import java.nio.file.Path;

import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.ConfigFileException;
import org.junit.jupiter.api.Test;

class SiteLoaderTest {
    static final Path SITES = Path.of("..", "config", "sites");

    private static final String GOOD = """
            siteId: tiny
            areas:
              - id: left
                nominalFrequencyHz: 50
                ratingMva: 1000
                inertiaS: 5
                dampingMwPerHz: 20
                kMwPerHz: 420
              - id: right
                nominalFrequencyHz: 50
                ratingMva: 1000
                inertiaS: 5
                dampingMwPerHz: 20
                kMwPerHz: 420
            ties:
              - id: lr
                fromArea: left
                toArea: right
                reactancePu: 0.5
                baseMva: 100
                initialAngleDiffDeg: 60
            units:
              - id: g1
                area: left
                turbine: nonReheat
                ratingMw: 500
                droopPct: 5
                governorTimeConstantS: 0.2
                turbineTimeConstantS: 0.4
                initialOutputMw: 300
            loads:
              - id: l1
                area: left
                baseMw: 300
            """;

    private static Grid load(String yaml) throws Exception {
        return SiteLoader.load("test.yaml", new StringReader(yaml));
    }

    @Test
    void shouldLoadTheDemoSiteWithTwoAreasAndSixUnitsOfMixedTypes() throws Exception {
        Grid grid = SiteLoader.load(SITES.resolve("demo-site.yaml"));
        assertThat(grid.siteId()).isEqualTo("demo-site");
        assertThat(grid.areas()).hasSize(2);
        assertThat(grid.units()).hasSize(6);
        assertThat(grid.units()).extracting(u -> u.turbine().getClass().getSimpleName())
                .contains("Reheat", "NonReheat", "Hydro");
    }

    @Test
    void shouldLoadTheMeshedThreeAreaSite() throws Exception {
        Grid grid = SiteLoader.load(SITES.resolve("three-area.yaml"));
        assertThat(grid.areas()).hasSize(3);
        assertThat(grid.ties()).hasSize(3);
        // T = cos(12°)/1.6 pu · 100 MVA for the tie given by its reactance
        assertThat(grid.ties().get(1).synchronizingMwPerRad()).isCloseTo(Math.cos(Math.toRadians(12)) / 1.6 * 100, within(1e-9));
    }

    @Test
    void shouldComputeTheSynchronizingCoefficientFromReactanceAndAngle() throws Exception {
        assertThat(load(GOOD).ties().get(0).synchronizingMwPerRad()).isCloseTo(0.5 / 0.5 * 100, within(1e-9));
    }

    @Test
    void shouldRefuseAnUnknownKeyWithItsLineAndAHint() throws Exception {
        String bad = GOOD.replace("    inertiaS: 5\n    dampingMwPerHz: 20\n    kMwPerHz: 420\n  - id: right",
                "    inertia: 5\n    dampingMwPerHz: 20\n    kMwPerHz: 420\n  - id: right");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("test.yaml:6:5: unknown key 'inertia' in area left (did you mean 'inertiaS'?)")
                .hasMessageContaining("test.yaml:3:5: area left is missing 'inertiaS'");
    }

    @Test
    void shouldRefuseNegativeInertiaPointingAtTheLine() throws Exception {
        String bad = GOOD.replaceFirst("inertiaS: 5", "inertiaS: -5");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .hasMessage("test.yaml:6:5: area left inertiaS: must be greater than 0 s, got -5.0");
    }

    @Test
    void shouldRefuseATieToAnUnknownArea() throws Exception {
        String bad = GOOD.replace("toArea: right", "toArea: middle");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("test.yaml:18:5: tie lr toArea: unknown area 'middle' (known: [left, right])");
    }

    @Test
    void shouldRefuseAUnitAboveItsRating() throws Exception {
        String bad = GOOD.replace("initialOutputMw: 300", "initialOutputMw: 300\n    maxOutputMw: 650");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("test.yaml:31:5: unit g1 maxOutputMw: is above the unit's rating (650.0 > 500.0 MW)");
    }

    @Test
    void shouldRefuseAMissingValueAndAWrongType() throws Exception {
        String bad = GOOD.replace("droopPct: 5", "droopPct:").replace("baseMw: 300", "baseMw: lots");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("test.yaml:27:14: droopPct of unit g1 has no value (a number is needed)")
                .hasMessageContaining("test.yaml:34:13: baseMw of load l1 must be a number, got 'lots'")
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(2));
    }

    @Test
    void shouldReportEveryProblemAtOnce() throws Exception {
        String bad = GOOD.replaceFirst("inertiaS: 5", "inertiaS: -5").replace("toArea: right", "toArea: middle")
                .replace("turbine: nonReheat", "turbine: diesel");
        assertThatThrownBy(() -> load(bad)).isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(3)
                        .anyMatch(p -> p.contains("must be nonReheat, reheat or hydro, got 'diesel'"))
                        .anyMatch(p -> p.contains("unknown area 'middle'")));
    }

    @Test
    void shouldRefuseBrokenYamlWithItsLocation() {
        assertThatThrownBy(() -> load("siteId: [unclosed\nareas: 3\n")).isInstanceOf(ConfigFileException.class)
                .hasMessageStartingWith("test.yaml:").hasMessageContaining("not valid YAML");
    }

    @Test
    void shouldPointAtAHydroUnitWithoutTransientDroopWhenTheScreenRefusesTheSite() throws Exception {
        // A hydro governor needs transient droop compensation against the water column's non-minimum-phase
        // response (from memory: Kundur, Power System Stability and Control, 1994, hydraulic turbine governors)
        Path site = Path.of("src", "test", "resources", "sites", "plain-hydro-three-area.yaml");
        assertThatThrownBy(() -> SiteLoader.loadForRun(site, w -> { }))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).hasSize(2)
                        .anySatisfy(p -> assertThat(p).contains("refused by the stability screen: unstable"))
                        .anySatisfy(p -> assertThat(p).contains("hint: hydro unit(s) e-hydro have no transient droop compensation")));

        Path compensated = java.nio.file.Files.createTempFile("compensated", ".yaml");
        try {
            java.nio.file.Files.writeString(compensated, java.nio.file.Files.readString(site).replace("waterStartingTimeS: 1.8,",
                    "waterStartingTimeS: 1.8, transientDroopPct: 33, resetTimeS: 8.2,"));
            assertThat(SiteLoader.loadForRun(compensated, w -> { }).units()).hasSize(5);
        } finally {
            java.nio.file.Files.deleteIfExists(compensated);
        }
    }
}
