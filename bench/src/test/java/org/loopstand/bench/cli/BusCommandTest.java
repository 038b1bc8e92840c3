package org.loopstand.bench.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.bench.probe.SeqPeek;
import org.loopstand.bench.run.BenchResult;
import org.loopstand.bench.run.BenchSettings;
import org.loopstand.bench.run.BusBench;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.site.SiteLoader;
import picocli.CommandLine;

class BusCommandTest {
    @TempDir
    Path dir;

    @Test
    void shouldParseOptionsIntoSettings() {
        BusCommand c = new BusCommand();
        new CommandLine(c).parseArgs("--units", "1000", "--areas", "20", "--duration", "30", "--grouping", "per-plant",
                "--intake-connections", "3", "--out", dir.toString());
        BenchSettings s = c.settings();
        assertThat(s.units()).isEqualTo(1000);
        assertThat(s.grouping()).isEqualTo(ConnectionGrouping.PER_PLANT);
        assertThat(s.intakeConnections()).isEqualTo(3);
        // 1000 units at 1 s + 20 meters at 2 s
        assertThat(s.plantRatePerS()).isEqualTo(1010.0);
    }

    @Test
    void shouldRefuseMoreAreasThanUnits() {
        BusCommand c = new BusCommand();
        new CommandLine(c).parseArgs("--units", "5", "--areas", "10");
        assertThatThrownBy(c::settings).hasMessageContaining("units ≥ areas");
    }

    @Test
    void shouldGenerateASiteBothReadersTake() throws Exception {
        Path f = SiteGenerator.write(dir.resolve("s.yaml"), "gen", 101, 7, 4);
        Grid g = SiteLoader.load(f);
        assertThat(g.units()).hasSize(101);
        assertThat(g.areas()).hasSize(7);
        var ctl = ControllerSiteReader.read(f);
        assertThat(ctl.units()).hasSize(101);
        assertThat(ctl.ties()).hasSize(7); // a ring of 7 areas has 7 ties
        assertThat(ctl.settings().cycleMs()).isEqualTo(4000);
    }

    @Test
    void shouldPeekTheSeqOfAPayload() {
        assertThat(SeqPeek.seq("{\"seq\":1700000000123,\"sourceTime\":5}".getBytes())).isEqualTo(1700000000123L);
        assertThat(SeqPeek.seq("{\"sourceTime\":5}".getBytes())).isEqualTo(-1);
    }

    @Test
    void shouldRunTenUnitsOnTheEmbeddedBroker() throws Exception {
        BenchSettings s = new BenchSettings(10, 2, 6, 2, "embedded", Path.of("config/broker/mosquitto-bench.conf"),
                ConnectionGrouping.POOLED, 2, 2, 1000, 2000, 1, 3, true, true, 100, 0, dir.resolve("run"));
        BenchResult r = new BusBench(s, line -> { }).run();
        r.write(s.outDir());
        assertThat(r.plantFailure()).isNull();
        // every unit and meter message went through the shared-subscription intake and was validated
        assertThat(r.rigUs().getTotalCount()).isGreaterThan(30);
        assertThat(r.rawUs().getTotalCount()).isGreaterThan(30);
        assertThat(r.commandsUnaccounted()).isZero();
        assertThat(Files.readString(s.outDir().resolve("table.md"))).contains("ratio p99 rig / raw");
    }
}
