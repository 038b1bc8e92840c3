package org.loopstand.controller.config;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.site.AceConvention;
import org.loopstand.controller.following.GovernorResponse;

class ControllerSiteReaderTest {
    @Test
    void shouldReadTheDemoSiteIgnoringPhysicsKeys() {
        ControllerSiteConfig c = ControllerSiteReader.read(Path.of("..", "config", "sites", "demo-site.yaml"));
        assertThat(c.siteId()).isEqualTo("demo-site");
        assertThat(c.areas()).extracting(SiteArea::id).containsExactly("north-basin", "south-ridge");
        assertThat(c.areas().get(0).convention()).isEqualTo(AceConvention.EUROPEAN);
        assertThat(c.areas().get(0).bias()).isEqualTo(954);
        assertThat(c.siteSchedule("north-basin").netInterchangeScheduledMw()).isEqualTo(100);
        assertThat(c.siteSchedule("south-ridge").netInterchangeScheduledMw()).isEqualTo(-100);
        assertThat(c.units()).hasSize(6);
        // regulating limits fall back to the output limits like the plant does
        assertThat(c.unit("ridge-steam-1").orElseThrow().maxMw()).isEqualTo(690);
        assertThat(c.settings().cycleMs()).isEqualTo(4000);
        assertThat(org.loopstand.controller.cycle.ControlCycleSettings.fromSite(c).areas()).hasSize(2);
    }

    @Test
    void shouldDeriveEachUnitsPrimaryResponseFromRatingDroopAndDeadBand() {
        ControllerSiteConfig c = ControllerSiteReader.read(Path.of("..", "config", "sites", "demo-site.yaml"));
        var governors = org.loopstand.controller.cycle.ControlCycleSettings.fromSite(c).governors();
        // β_unit = ratingMw / (droopPct/100 · f0): 700 / (0.04 · 50) = 350 MW/Hz, 500 / (0.05 · 50) = 200 MW/Hz
        assertThat(governors.get("ridge-steam-1").mwPerHz()).isEqualTo(350);
        assertThat(governors.get("ridge-hydro-1").mwPerHz()).isEqualTo(200);
        // basin-steam-1: 900 / (0.05 · 50) = 360 MW/Hz with its 10 mHz dead band
        assertThat(governors.get("basin-steam-1").mwPerHz()).isEqualTo(360);
        assertThat(governors.get("basin-steam-1").deadBandHz()).isEqualTo(0.01);
        // ramp lags from the turbine data (physics.md models): reheat Tg + Tch + (1 − Fhp)·Trh = 0.2 + 0.3 + 0.7·7;
        // hydro Tg + 1.5·Tw + (Rt/Rp − 1)·Tr = 0.5 + 3 + (43/5 − 1)·9
        assertThat(governors.get("ridge-steam-1").responseLagS()).isCloseTo(5.4, org.assertj.core.api.Assertions.within(1e-9));
        assertThat(governors.get("ridge-hydro-1").responseLagS()).isCloseTo(71.9, org.assertj.core.api.Assertions.within(1e-9));
        assertThat(c.settings().following().governorSettleMs()).isEqualTo(120_000);
    }

    /** One area, one unit, and the controller section's first line; a test adds its keys below. */
    private static final String ONE_UNIT_SITE = """
            siteId: s
            areas:
              - {id: a1, nominalFrequencyHz: 50, aceConvention: european, kMwPerHz: 1000}
            units:
              - {id: u1, area: a1}
            controller:
            """;

    @Test
    void shouldTakeFreezeDetectionInScenarioTimeByDefaultAndPerSiteAndRefuseTheOldCount() {
        ControllerSiteConfig demo = ControllerSiteReader.read(Path.of("..", "config", "sites", "demo-site.yaml"));
        // defaults for the frequency, the demo site's own for its ties
        assertThat(demo.settings().frequency().frozenAfterMs()).isEqualTo(22_000);
        assertThat(demo.settings().frequency().frozenMinReadings()).isEqualTo(6);
        assertThat(demo.settings().tieFlow().frozenAfterMs()).isEqualTo(8_000);
        assertThat(demo.settings().tieFlow().frozenMinReadings()).isEqualTo(3);
        String site = ONE_UNIT_SITE + """
                  intake:
                    frequency: {%s}
                """;
        ControllerSiteConfig off = ControllerSiteReader.read("off.yaml", site.formatted("frozenAfterMs: 0"));
        assertThat(off.settings().frequency().frozenAfterMs()).isZero();
        assertThatThrownBy(() -> ControllerSiteReader.read("old.yaml", site.formatted("frozenCount: 12")))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems())
                        .anySatisfy(p -> assertThat(p).startsWith("old.yaml:8:").contains("frozenCount", "frozenAfterMs")));
    }

    @Test
    void shouldReadTheReadmissionProbeOfTheFollowingCheckAndRefuseABadOne() {
        String site = ONE_UNIT_SITE + """
                  following: {probeIntervalMs: %s, probeMw: 7.5}
                """;
        ControllerSiteConfig c = ControllerSiteReader.read("ok.yaml", site.formatted("90000"));
        assertThat(c.settings().following().probeIntervalMs()).isEqualTo(90_000);
        assertThat(c.settings().following().probeMw()).isEqualTo(7.5);
        assertThatThrownBy(() -> ControllerSiteReader.read("bad.yaml", site.formatted("10")))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems())
                        .anySatisfy(p -> assertThat(p).contains("probeIntervalMs")));
    }

    @Test
    void shouldNameEveryProblemWithFileAndLine() {
        assertThatThrownBy(() -> ControllerSiteReader.read("bad.yaml", """
                siteId: s
                areas:
                  - id: a1
                    nominalFrequencyHz: 60
                    aceConvention: northAmerican
                    biasMwPer01Hz: 34
                  - id: a2
                    nominalFrequencyHz: 60
                    aceConvention: northAmerican
                units:
                  - {id: u1, area: nowhere}
                controller:
                  cycleS: 20
                  regulaton: {kp: 1}
                """)).isInstanceOf(ConfigFileException.class).satisfies(e -> {
                    ConfigFileException x = (ConfigFileException) e;
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p).startsWith("bad.yaml:3:").contains("B = -34"));
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p).startsWith("bad.yaml:7:").contains("biasMwPer01Hz"));
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p).startsWith("bad.yaml:11:").contains("nowhere"));
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p).startsWith("bad.yaml:13:").contains("[1, 10]"));
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p).startsWith("bad.yaml:14:").contains("regulaton"));
                    // one form for every config file: file:line:column: message
                    assertThat(x.problems()).allSatisfy(p -> assertThat(p).matches("bad\\.yaml:\\d+:\\d+: .*"));
                    assertThat(x.problems()).anySatisfy(p -> assertThat(p)
                            .startsWith("bad.yaml:13:3: cycleS of controller = 20 is outside [1, 10]"));
                });
    }
}
