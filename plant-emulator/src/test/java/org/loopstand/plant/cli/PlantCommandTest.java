package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.WatchdogAction;
import org.loopstand.protocol.bus.Qos;
import picocli.CommandLine;

class PlantCommandTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");

    PlantOptions parse(String... args) throws Exception {
        PlantCommand c = new PlantCommand();
        new CommandLine(c).parseArgs(args);
        Grid grid = SiteLoader.load(SITE);
        return c.options(grid);
    }

    @Test
    void shouldRunOnlyTheListedUnitsHereAndTheRestElsewhere() throws Exception {
        PlantOptions o = parse("--site", SITE.toString(), "--units", "basin-steam-1,ridge-hydro-1", "--grouping", "per-plant",
                "--meter-scan", "south-ridge=500", "--telemetry-scan", "basin-gas-1=250", "--accept-controller", "agc-a,agc-b",
                "--watchdog-action", "base-point", "--telemetry-qos", "1");
        assertThat(o.remoteUnits()).containsExactlyInAnyOrder("basin-steam-2", "basin-gas-1", "ridge-hydro-2", "ridge-steam-1");
        assertThat(o.grouping()).isEqualTo(ConnectionGrouping.PER_PLANT);
        assertThat(o.meters()).extracting(m -> m.area() + "=" + m.scanPeriodMs()).containsExactly("north-basin=2000", "south-ridge=500");
        assertThat(o.interfaces().telemetryScanMsFor("basin-gas-1")).isEqualTo(250);
        assertThat(o.interfaces().telemetryScanMsFor("basin-steam-1")).isEqualTo(2000);
        assertThat(o.interfaces().acceptedControllers()).containsExactlyInAnyOrder("agc-a", "agc-b");
        assertThat(o.interfaces().watchdogAction()).isEqualTo(WatchdogAction.BASE_POINT);
        assertThat(o.telemetryQos()).isEqualTo(Qos.AT_LEAST_ONCE);
        assertThat(parse("--site", SITE.toString(), "--no-units").remoteUnits()).hasSize(6);
        assertThat(parse("--site", SITE.toString()).remoteUnits()).isEmpty();
    }

    @Test
    void shouldRefuseBadOptionsNamingThem() {
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--units", "nope")).hasMessageContaining("--units: unit 'nope'");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--units", "basin-gas-1", "--no-units"))
                .hasMessageContaining("exclude each other");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--grouping", "mesh")).hasMessageContaining("--grouping");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--meter-scan", "west=100")).hasMessageContaining("area 'west'");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--rate", "0")).hasMessageContaining("--rate");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--watchdog-action", "panic")).hasMessageContaining("--watchdog-action");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--telemetry-pacing", "even"))
                .hasMessageContaining("--telemetry-pacing must be burst or spread, got even");
        assertThatThrownBy(() -> parse("--site", SITE.toString(), "--telemetry-pacing", "spread", "--publish-on-loop"))
                .hasMessageContaining("--telemetry-pacing spread needs the publisher thread");
    }
}
