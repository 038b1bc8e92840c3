package org.loopstand.protocol.site;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.config.ConfigFileException;

class SiteReaderTest {
    private static final Path DEMO = Path.of("..", "config", "sites", "demo-site.yaml");

    /** One area and one unit with its regulating figures only: enough for a controller, not for the physics. */
    private static final String CONTROL_ONLY = """
            siteId: s
            areas:
              - {id: a1, nominalFrequencyHz: 50, aceConvention: european, kMwPerHz: 1000}
            units:
              - {id: u1, area: a1, regulatingMinMw: 10, regulatingMaxMw: 90, costB: 8}
            """;

    @Test
    void shouldReadTheDemoSiteForThePhysicsWithEveryFigureTyped() {
        SiteFile site = SiteReader.read(DEMO, SiteUse.PHYSICS);
        assertThat(site.siteId()).isEqualTo("demo-site");
        assertThat(site.areas()).extracting(SiteFile.Area::id).containsExactly("north-basin", "south-ridge");
        assertThat(site.areas().get(0).kMwPerHz()).isEqualTo(954);
        assertThat(site.areas().get(0).biasMwPer01Hz()).isNaN();
        SiteFile.Unit steam = site.unit("basin-steam-1").orElseThrow();
        assertThat(steam.turbine().kind()).isEqualTo(TurbineKind.REHEAT);
        assertThat(steam.turbine().hpFraction()).isEqualTo(0.3);
        assertThat(steam.limits().regulatingHighMw(Double.NaN)).isEqualTo(870);
        assertThat(steam.cost()).isEqualTo(new SiteFile.Cost(560, 7.9, 0.0016));
        assertThat(site.ties().get(0).direct()).isTrue();
        // where each key is written, for checks made after reading: "    droopPct: 5" is line 31
        assertThat(steam.where().of("droopPct").toString()).isEqualTo(DEMO + ":31:5");
    }

    @Test
    void shouldLetAControllerLeaveThePhysicsOutButNotThePlant() {
        SiteFile site = SiteReader.read("c.yaml", CONTROL_ONLY, SiteUse.CONTROL);
        assertThat(site.unit("u1").orElseThrow().ratingMw()).isNaN();
        assertThat(site.unit("u1").orElseThrow().limits().regulatingLowMw(0)).isEqualTo(10);
        assertThatThrownBy(() -> SiteReader.read("c.yaml", CONTROL_ONLY, SiteUse.PHYSICS))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).containsExactly(
                        "c.yaml:3:5: area a1 is missing 'ratingMva'",
                        "c.yaml:3:5: area a1 is missing 'inertiaS'",
                        "c.yaml:3:5: area a1 is missing 'dampingMwPerHz'",
                        "c.yaml:5:5: unit u1 is missing 'ratingMw'",
                        "c.yaml:5:5: unit u1 is missing 'droopPct'",
                        "c.yaml:5:5: unit u1 is missing 'governorTimeConstantS'",
                        "c.yaml:5:5: unit u1 is missing 'turbine'"));
    }

    @Test
    void shouldNameAWrongWordAnUnknownKeyAndATieGivenTwoWays() {
        String bad = CONTROL_ONLY.replace("aceConvention: european", "aceConvention: europe")
                .replace("costB: 8", "costB: 8, cosC: 0.01") + """
                ties:
                  - {id: t1, fromArea: a1, toArea: a1, synchronizingMwPerRad: 100, reactancePu: 0.1}
                """;
        assertThatThrownBy(() -> SiteReader.read("b.yaml", bad, SiteUse.CONTROL))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).containsExactly(
                        "b.yaml:3:38: aceConvention of area a1 must be european or northAmerican, got 'europe'"
                                + " (did you mean 'european'?)",
                        "b.yaml:5:76: unknown key 'cosC' in unit u1 (did you mean 'costC'?); allowed here: [id, area,"
                                + " ratingMw, droopPct, governorTimeConstantS, deadBandHz, raiseRateMwPerMin,"
                                + " lowerRateMwPerMin, online, tripTimeConstantS, acceptsSetpoints, costA, costB, costC,"
                                + " minOutputMw, maxOutputMw, initialOutputMw, regulatingMinMw, regulatingMaxMw,"
                                + " rampMwPerMin, pulseRateMwPerMin, turbine, turbineTimeConstantS,"
                                + " steamChestTimeConstantS, reheatTimeConstantS, hpFraction, waterStartingTimeS,"
                                + " transientDroopPct, resetTimeS]",
                        "b.yaml:7:5: tie t1 needs exactly one of synchronizingMwPerRad or reactancePu (with baseMva and"
                                + " initialAngleDiffDeg)"));
    }
}
