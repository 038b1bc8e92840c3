package org.loopstand.bench.cli;

import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.concurrent.Callable;
import org.loopstand.bench.run.BenchResult;
import org.loopstand.bench.run.BenchSettings;
import org.loopstand.bench.run.BusBench;
import org.loopstand.bench.run.HostsBench;
import org.loopstand.bench.run.HostsResult;
import org.loopstand.bench.run.ProcessesBench;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code ./loopstand bench bus}: plant + controller + raw Paho loop at a chosen size, one JVM, one clock; or
 * plant and controller in processes of their own; or the whole rig across network-namespace hosts on a
 * three-node broker cluster ({@code --layout hosts}).
 */
@Command(name = "bus", mixinStandardHelpOptions = true,
        description = "Generate a site, run plant and controller over a broker beside a raw Paho loop, and write the figures.")
public final class BusCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--units", required = true, description = "units in the generated site")
    int units;

    @Option(names = "--areas", defaultValue = "50", description = "areas (default ${DEFAULT-VALUE})")
    int areas;

    @Option(names = {"--wall-duration-s", "--duration-s", "--duration"}, defaultValue = "60", description = "measured wall seconds after the warm-up (default ${DEFAULT-VALUE})")
    double durationS;

    @Option(names = "--warmup", defaultValue = "20", description = "wall seconds before measuring (default ${DEFAULT-VALUE})")
    double warmupS;

    @Option(names = "--broker", defaultValue = "embedded", description = "embedded, mosquitto (started here on a free port) or a tcp:// URL (default ${DEFAULT-VALUE})")
    String broker;

    @Option(names = "--broker-config", defaultValue = "${env:LOOPSTAND_HOME:-.}/config/broker/mosquitto-bench.conf", description = "config for --broker mosquitto (default ${DEFAULT-VALUE})")
    Path brokerConfig;

    @Option(names = "--grouping", defaultValue = "pooled", description = "per-unit, per-plant or pooled (default ${DEFAULT-VALUE})")
    String grouping;

    @Option(names = "--pool-size", defaultValue = "8", description = "plant connections for pooled; --layout hosts:"
            + " connections of each unit host (default ${DEFAULT-VALUE})")
    int poolSize;

    @Option(names = "--intake-connections", defaultValue = "2", description = "controller connections sharing the intake (default ${DEFAULT-VALUE})")
    int intakeConnections;

    @Option(names = "--telemetry-ms", defaultValue = "1000", description = "unit telemetry period, ms, 10..9000 (the controller takes a reading for 10 s at most);"
            + " --layout hosts: each unit host's units publish at it (default ${DEFAULT-VALUE})")
    long telemetryMs;

    @Option(names = {"--meter-scan-ms", "--meter-ms"}, defaultValue = "2000", description = "area meter period, ms, 10..9000 (default ${DEFAULT-VALUE})")
    long meterMs;

    @Option(names = "--cycle-s", defaultValue = "4", description = "controller cycle, s (default ${DEFAULT-VALUE})")
    int cycleS;

    @Option(names = "--sample-s", defaultValue = "30", description = "heap/CPU sample period, s (default ${DEFAULT-VALUE})")
    double sampleS;

    @Option(names = "--no-raw", description = "do not run the raw Paho loop")
    boolean noRaw;

    @Option(names = "--no-wake", description = "controller runner idles 1 ms without being woken by its intake (comparison)")
    boolean noWake;

    @Option(names = "--unit-scan-ms", defaultValue = "100", description = "plant unit interface scan period, ms; 0 = after every physics step (default ${DEFAULT-VALUE})")
    long unitScanMs;

    @Option(names = "--load-step-mw", defaultValue = "100", description = "load step in the first area at 5 s and every 60 s, alternating sign, MW; 0 = none (default ${DEFAULT-VALUE})")
    double loadStepMw;

    @Option(names = "--layout", defaultValue = "one-jvm", description = "one-jvm (plant, controller and raw loop in this JVM, one clock),"
            + " processes (plant and controller each in a JVM of their own, as in production) or hosts (a three-node"
            + " Artemis cluster on network-namespace hosts, the plant, two unit hosts and the controller each on a host;"
            + " needs root and iproute2; --broker and the raw loop do not apply) (default ${DEFAULT-VALUE})")
    String layout;

    @Option(names = "--field-scan-ms", defaultValue = "200", description = "--layout hosts: period of the plant's field"
            + " readings to the units' interfaces on the unit hosts, ms (default ${DEFAULT-VALUE}, as the plant's)")
    long fieldScanMs;

    @Option(names = "--node-config", defaultValue = "${env:LOOPSTAND_HOME:-.}/config/broker/artemis/broker-node.xml", description = "--layout hosts:"
            + " the broker node file (default ${DEFAULT-VALUE})")
    Path nodeConfig;

    @Option(names = "--raw-pacing", defaultValue = "spread", description = "raw loop: spread (1 ms slots) or burst (one burst per"
            + " physics step, as the plant publishes) (default ${DEFAULT-VALUE})")
    String rawPacing;

    @Option(names = "--plant-pacing", defaultValue = "loop", description = "plant: loop (publish on the physics thread,"
            + " each step's due telemetry in one burst), burst (the same burst through the plant's publisher thread) or"
            + " spread (the publisher thread spreads each step's unit telemetry over the step) (default ${DEFAULT-VALUE})")
    String plantPacing;

    @Option(names = "--part-jvm-opts", defaultValue = "-Xss1m", description = "JVM options of the plant and controller processes"
            + " (--layout processes); {role} is replaced by plant or controller (default ${DEFAULT-VALUE})")
    String partJvmOpts;

    @Option(names = {"--run-dir", "--out"}, description = "run folder (default runs/bench-<time>)")
    Path out;

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.cli.OldSpellings.of("--duration", "--wall-duration-s", "--meter-ms", "--meter-scan-ms", "--out", "--run-dir")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        BenchSettings s;
        try {
            s = settings();
        } catch (IllegalArgumentException e) {
            System.err.println("bench: " + e.getMessage());
            return 2;
        }
        if (s.layout() == BenchSettings.Layout.HOSTS) {
            return runHosts(s);
        }
        BenchResult r = s.layout() == BenchSettings.Layout.PROCESSES
                ? new ProcessesBench(s, BusCommand::say, List.of(BenchCli.class.getName(), "bus-part")).run()
                : new BusBench(s, BusCommand::say).run();
        r.write(s.outDir());
        r.print(System.out);
        say("bench: table, samples.csv, bench.hlog and controller.hlog in " + s.outDir());
        return r.plantFailure() == null ? 0 : 1;
    }

    private Integer runHosts(BenchSettings s) throws Exception {
        HostsResult r;
        try {
            r = new HostsBench(s, nodeConfig, BusCommand::say, List.of(BenchCli.class.getName(), "bus-part")).run();
        } catch (HostsBench.NamespacesUnavailable e) {
            System.err.println("bench: --layout hosts: " + e.getMessage());
            return 3;
        } catch (IllegalArgumentException e) {
            System.err.println("bench: " + e.getMessage());
            return 2;
        }
        r.write(s.outDir());
        r.print(System.out);
        say("bench: hosts-table.txt, hosts-result.json and every process's log in " + s.outDir());
        return r.plantFailure() == null ? 0 : 1;
    }

    BenchSettings settings() {
        ConnectionGrouping g;
        try {
            g = ConnectionGrouping.parse(grouping);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("--grouping must be per-unit, per-plant or pooled, got " + grouping);
        }
        Path dir = out != null ? out : Path.of("runs", "bench-" + DateTimeFormatter.ofPattern("yyyyMMdd-HHmmss")
                .format(Instant.ofEpochMilli(WallClock.INSTANCE.epochMillis()).atZone(ZoneId.systemDefault())));
        BenchSettings.Layout l = BenchSettings.Layout.parse(layout);
        return new BenchSettings(units, areas, durationS, warmupS, broker, brokerConfig, g, poolSize, intakeConnections,
                telemetryMs, meterMs, cycleS, sampleS, !noRaw, !noWake, unitScanMs, loadStepMw, dir,
                l, BenchSettings.RawPacing.parse(rawPacing), partJvmOpts, l == BenchSettings.Layout.HOSTS ? "bench" : "",
                fieldScanMs, BenchSettings.PlantPublishing.parse(plantPacing));
    }

    private static void say(String line) {
        System.out.println(line);
        System.out.flush();
    }
}
