package org.loopstand.bench.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.bench.probe.SeqPeek;
import org.loopstand.bench.run.BenchResult;
import org.loopstand.bench.run.BenchSettings;
import org.loopstand.bench.run.BusBench;
import org.loopstand.bench.run.ProcessesBench;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.site.SiteLoader;
import picocli.CommandLine;

class BusCommandTest {
    /** One embedded broker for both layouts' runs (a HiveMQ start and stop costs seconds). */
    private static EmbeddedBroker broker;

    @TempDir
    Path dir;

    @BeforeAll
    static void startBroker() throws Exception {
        broker = new EmbeddedBroker(EmbeddedBroker.DEFAULT_BIND_ADDRESS, 0);
        broker.start(Duration.ofSeconds(30));
    }

    @AfterAll
    static void stopBroker() {
        broker.close();
    }

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
        assertThat(s.layout()).isEqualTo(BenchSettings.Layout.ONE_JVM);
        assertThat(s.rawPacing()).isEqualTo(BenchSettings.RawPacing.SPREAD);
        assertThat(s.plantPacing()).isEqualTo(BenchSettings.PlantPublishing.LOOP);
    }

    @Test
    void shouldParseTheLayoutAndRawPacing() {
        BusCommand c = new BusCommand();
        new CommandLine(c).parseArgs("--units", "100", "--layout", "processes", "--raw-pacing", "burst",
                "--plant-pacing", "spread", "--part-jvm-opts", "-Xmx1g -Xss1m");
        BenchSettings s = c.settings();
        assertThat(s.plantPacing()).isEqualTo(BenchSettings.PlantPublishing.SPREAD);
        assertThat(s.layout()).isEqualTo(BenchSettings.Layout.PROCESSES);
        assertThat(s.rawPacing()).isEqualTo(BenchSettings.RawPacing.BURST);
        assertThat(s.partJvmOpts()).isEqualTo("-Xmx1g -Xss1m");
        assertThat(s.brokerUser()).as("no login off the cluster").isEmpty();
        BusCommand bad = new BusCommand();
        new CommandLine(bad).parseArgs("--units", "100", "--layout", "two-jvms");
        assertThatThrownBy(bad::settings).hasMessageContaining("--layout must be one-jvm, processes or hosts, got two-jvms");
        BusCommand badPacing = new BusCommand();
        new CommandLine(badPacing).parseArgs("--units", "100", "--plant-pacing", "even");
        assertThatThrownBy(badPacing::settings).hasMessageContaining("--plant-pacing must be loop, burst or spread, got even");
    }

    @Test
    void shouldParseTheHostsLayoutWithItsLoginAndFieldPeriod() {
        BusCommand c = new BusCommand();
        new CommandLine(c).parseArgs("--units", "1000", "--layout", "hosts", "--duration-s", "180", "--field-scan-ms", "1000");
        BenchSettings s = c.settings();
        assertThat(s.layout()).isEqualTo(BenchSettings.Layout.HOSTS);
        assertThat(s.brokerUser()).as("the cluster's nodes ask every client to log in").isEqualTo("bench");
        assertThat(s.fieldScanMs()).isEqualTo(1000);
        assertThat(s.durationS()).isEqualTo(180);
        BusCommand bad = new BusCommand();
        new CommandLine(bad).parseArgs("--units", "100", "--layout", "hosts", "--field-scan-ms", "0");
        assertThatThrownBy(bad::settings).hasMessageContaining("field scan period must be ≥ 1 ms and ≤ 60000 ms, got 0");
    }

    @Test
    void shouldTakeATelemetryPeriodUpToNineSecondsAndRefuseLonger() {
        BusCommand c = new BusCommand();
        new CommandLine(c).parseArgs("--units", "10000", "--layout", "hosts", "--telemetry-ms", "5000");
        BenchSettings s = c.settings();
        assertThat(s.telemetryScanMs()).isEqualTo(5000);
        // 10,000 units each 5 s + 50 meters each 2 s
        assertThat(s.plantRatePerS()).isEqualTo(2025.0);
        assertThat(s.unitTelemetryMaxAgeMs()).as("the controller's 10 s default covers 5 s + 200 ms + 4 s").isEqualTo(10_000);
        BusCommand slow = new BusCommand();
        new CommandLine(slow).parseArgs("--units", "10000", "--layout", "hosts", "--telemetry-ms", "5000",
                "--field-scan-ms", "4000");
        // a unit's telemetry carries its field reading's time: up to 4 s + 5 s old, and 4 s for the way
        assertThat(slow.settings().unitTelemetryMaxAgeMs()).isEqualTo(13_000);
        BusCommand tooLong = new BusCommand();
        new CommandLine(tooLong).parseArgs("--units", "100", "--telemetry-ms", "10000");
        assertThatThrownBy(tooLong::settings).hasMessageContaining("telemetry and meter periods must be 10..9000 ms")
                .hasMessageContaining("got 10000 and 2000");
        BusCommand tooShort = new BusCommand();
        new CommandLine(tooShort).parseArgs("--units", "100", "--meter-scan-ms", "5");
        assertThatThrownBy(tooShort::settings).hasMessageContaining("got 1000 and 5");
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
        assertThat(ctl.settings().unitTelemetryMaxAgeMs()).as("the controller's default").isEqualTo(10_000);
        var slow = ControllerSiteReader.read(SiteGenerator.write(dir.resolve("slow.yaml"), "gen", 101, 7, 4, 13_000));
        assertThat(slow.settings().unitTelemetryMaxAgeMs()).isEqualTo(13_000);
    }

    @Test
    void shouldPeekTheSeqOfAPayload() {
        assertThat(SeqPeek.seq("{\"seq\":1700000000123,\"sourceTime\":5}".getBytes())).isEqualTo(1700000000123L);
        assertThat(SeqPeek.seq("{\"sourceTime\":5}".getBytes())).isEqualTo(-1);
    }

    @Test
    void shouldRunTenUnitsInOneJvm() throws Exception {
        BenchSettings s = new BenchSettings(10, 2, 4, 2, broker.serverUri(), Path.of("config/broker/mosquitto-bench.conf"),
                ConnectionGrouping.POOLED, 2, 2, 1000, 2000, 1, 3, true, true, 100, 0, dir.resolve("run"),
                BenchSettings.Layout.ONE_JVM, BenchSettings.RawPacing.SPREAD, "-Xss1m", "", 200,
                BenchSettings.PlantPublishing.SPREAD);
        java.util.List<String> said = new java.util.concurrent.CopyOnWriteArrayList<>();
        BenchResult r = new BusBench(s, said::add).run();
        r.write(s.outDir());
        assertThat(r.plantFailure()).isNull();
        // every unit and meter message went through the shared-subscription intake and was validated
        assertThat(r.rigUs().getTotalCount()).isGreaterThan(30);
        assertThat(r.rawUs().getTotalCount()).isGreaterThan(30);
        assertThat(r.commandsUnaccounted()).isZero();
        assertThat(Files.readString(s.outDir().resolve("table.md"))).contains("ratio p99 rig / raw", "plant pacing spread");
        // the plant published through its publisher thread, spreading each step's telemetry
        assertThat(said).anyMatch(l -> l.startsWith("bench: plant publisher thread: ") && l.contains("step telemetry: spread "));
    }

    @Test
    void shouldMeasureTenUnitsWithPlantAndControllerInProcessesOfTheirOwn() throws Exception {
        BenchSettings s = new BenchSettings(10, 2, 4, 2, broker.serverUri(), Path.of("config/broker/mosquitto-bench.conf"),
                ConnectionGrouping.POOLED, 2, 2, 1000, 2000, 1, 2, true, true, 100, 0, dir.resolve("run"),
                BenchSettings.Layout.PROCESSES, BenchSettings.RawPacing.BURST, "-Xss1m -Xmx128m", "", 200);
        BenchResult r = new ProcessesBench(s, line -> { }, java.util.List.of(BenchCli.class.getName(), "bus-part")).run();
        r.write(s.outDir());
        assertThat(r.plantFailure()).isNull();
        // the figures came from the two processes: the controller's cycles and input ages, the plant's steps
        assertThat(r.jitterUs().getTotalCount()).isGreaterThan(0);
        assertThat(r.meterAgeMs().getTotalCount()).isGreaterThan(0);
        assertThat(r.unitAgeMs().getTotalCount()).isGreaterThan(0);
        assertThat(r.stepLatenessUs().getTotalCount()).isGreaterThan(100);
        assertThat(r.samplesByProcess().get("controller process")).isNotEmpty();
        assertThat(r.samplesByProcess().get("plant process")).isNotEmpty();
        assertThat(r.after().routed()).isGreaterThan(30);
        // every command (if the cycles sent any) was acked or reported failed
        assertThat(r.commandsUnaccounted()).isZero();
        // plant and controller ran as their own processes, each writing its figures
        assertThat(s.outDir().resolve("part-plant.properties")).exists();
        assertThat(s.outDir().resolve("part-controller.properties")).exists();
        assertThat(r.rigUs()).isNull();
        assertThat(r.rawUs().getTotalCount()).isGreaterThan(30);
        assertThat(Files.readString(s.outDir().resolve("table.md"))).contains("layout processes").contains("plant process: heap");
    }
}
