package org.loopstand.app.campaign;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.config.ConfigFileException;

/** A campaign file is refused before any run, every problem at its file:line:column. */
class CampaignReaderTest {
    @TempDir
    Path dir;

    private List<String> problems(String body) throws Exception {
        Path file = CampaignFiles.campaign(dir, "bad.yaml", body);
        ConfigFileException e = (ConfigFileException) org.assertj.core.api.Assertions.catchThrowable(
                () -> CampaignReader.read(file, dir));
        assertThat(e).as("refused").isNotNull();
        return e.problems();
    }

    @Test
    void shouldReadAValidCampaignWithItsDistributions() throws Exception {
        Path file = CampaignFiles.campaign(dir, "ok.yaml", """
                runs: 7
                masterSeed: 99
                faultsPerRun: {min: 1, max: 2}
                faults:
                  - type: commandDelay
                    weight: 2
                    targets: [ridge-hydro-1, ridge-steam-1]
                    startS: {min: 10, max: 40}
                    durationS: [20, 60]
                    parameters:
                      delayMs: {min: 2000, max: 9000}
                loadEventsPerRun: 1
                loadEvents:
                  - {type: loadRamp, areas: [north-basin], atS: 30, deltaMw: {min: -20, max: 20}, durationS: 40}
                """);

        CampaignSpec spec = CampaignReader.read(file, dir);

        assertThat(spec.runs()).isEqualTo(7);
        assertThat(spec.masterSeed()).isEqualTo(99);
        assertThat(spec.baseDurationS()).isEqualTo(150.0);
        assertThat(spec.siteFile()).isEqualTo(CampaignFiles.SITE);
        assertThat(spec.faultsPerRun()).isEqualTo(new CampaignSpec.IntRange(1, 2));
        CampaignSpec.FaultDraw f = spec.faults().get(0);
        assertThat(f.type()).isEqualTo("commandDelay");
        assertThat(f.weight()).isEqualTo(2.0);
        assertThat(f.targets()).containsExactly("ridge-hydro-1", "ridge-steam-1");
        assertThat(f.startS()).isEqualTo(new Distribution.Uniform(10, 40));
        assertThat(f.durationS()).isEqualTo(new Distribution.OneOf(List.of(20.0, 60.0)));
        assertThat(f.parameters().get("delayMs")).isEqualTo(new Distribution.Uniform(2000, 9000));
        assertThat(spec.loadEvents().get(0).durationS()).isEqualTo(new Distribution.Uniform(40, 40));
        assertThat(spec.shrink()).isEqualTo(new CampaignSpec.Shrink(5, 24, 10));
    }

    @Test
    void shouldRefuseUnknownFaultKindsTargetsAndParametersNamingTheirLines() throws Exception {
        List<String> p = problems("""
                masterSeed: 1
                faults:
                  - type: commandDelya
                    targets: [ridge-hydro-1]
                    startS: 10
                    durationS: 20
                  - type: commandDrop
                    targets: [ridge-hydro-9]
                    startS: 10
                    durationS: 20
                  - type: slowResponse
                    targets: [ridge-hydro-1]
                    startS: 10
                    durationS: 20
                    parameters:
                      slowFactr: 3
                """);

        // lines count the three lines put in front (site, siteFile, scenario)
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:6:").contains("unknown fault type 'commandDelya'"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:11:").contains("unknown target 'ridge-hydro-9'"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:19:").contains("has no parameter 'slowFactr'"));
        assertThat(p).hasSize(3);
    }

    @Test
    void shouldRefuseEmptyAndContradictoryDistributionsAndWindowsPastTheEndNamingTheirLines() throws Exception {
        List<String> p = problems("""
                masterSeed: 1
                faults:
                  - type: commandDrop
                    targets: []
                    startS: {min: 100, max: 20}
                    durationS: 20
                  - type: ignorePulses
                    targets: [ridge-hydro-7]
                    startS: {min: 50, max: 10}
                    durationS: 20
                  - type: commandDelay
                    targets: [ridge-hydro-1]
                    startS: {min: 0, max: 100}
                    durationS: {min: 10, max: 60}
                    parameters:
                      delayMs: {min: 1000, max: 900000}
                loadEventsPerRun: 1
                loadEvents:
                  - {type: loadStep, areas: [north-basin], atS: 200, deltaMw: []}
                """);

        assertThat(p).anySatisfy(s -> assertThat(s).startsWith(dir.resolve("bad.yaml") + ":7:").contains("targets of fault is an empty list"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:8:").contains("contradictory: min 100 is above max 20"));
        // an unknown target is named even beside a contradictory range of the same entry
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:11:").contains("unknown target 'ridge-hydro-7'"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:12:").contains("contradictory: min 50 is above max 10"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:17:").contains("a window can end at 160 s").contains("(150 s)"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:19:").contains("delayMs must lie in [0, 600000] ms, got 900000"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:22:").contains("deltaMw of load event is an empty list"));
        assertThat(p).anySatisfy(s -> assertThat(s).contains("bad.yaml:22:").contains("atS 200 must lie in [0, 150) s"));
    }

    @Test
    void shouldRefuseACampaignThatAllowsFaultsButNamesNone() {
        assertThatThrownBy(() -> CampaignReader.read(CampaignFiles.campaign(dir, "bad.yaml", "masterSeed: 1\nfaults: []\n"), dir))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("bad.yaml:5:").hasMessageContaining("faults of campaign is empty");
    }

    @Test
    void shouldFindASiteNamedByIdAsTheOtherCommandsDoAndNameThePlacesWhenNoneIsThere() throws Exception {
        // the shipped campaign names only siteId: its site is in config/sites, next to config/campaigns
        CampaignSpec shipped = CampaignReader.read(Path.of("..", "config", "campaigns", "demo-unit-trip.yaml"), dir);
        assertThat(shipped.siteFile().toAbsolutePath().normalize()).isEqualTo(CampaignFiles.SITE);

        java.nio.file.Files.writeString(dir.resolve("lost.yaml"), java.nio.file.Files.readString(
                Path.of("..", "config", "campaigns", "demo-unit-trip.yaml")).replace("siteId: demo-site", "siteId: nowhere"));
        assertThatThrownBy(() -> CampaignReader.read(dir.resolve("lost.yaml"), dir))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("lost.yaml:5:").hasMessageContaining("no site file for siteId 'nowhere'")
                .hasMessageContaining(dir.resolve("config/sites/nowhere.yaml").toString());
    }
}
