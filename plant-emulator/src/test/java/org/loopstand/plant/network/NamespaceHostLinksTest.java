package org.loopstand.plant.network;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.fault.NetworkFault;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Network faults from the scenario to the host links: the hosts file, the commands a partition and a
 * delay/loss fault run, the refusal of delay/loss on a kernel without netem (as this machine's:
 * "Specified qdisc kind is unknown"), and the journal's account of each change. The commands go to a
 * recording runner; the namespace test in the broker-node module runs them for real.
 */
class NamespaceHostLinksTest {
    private static final String HOSTS = """
            hosts: [plant-host, unit-host, control-host]
            links:
              - {between: [plant-host, control-host], namespace: lab-hub, interfaces: [hub-p3]}
            """;
    private static final String NO_NETEM = "Error: Specified qdisc kind is unknown.";

    @TempDir
    Path dir;

    private final List<String> commands = new ArrayList<>();

    private CommandRunner recording(boolean netem) {
        return cmd -> {
            String line = String.join(" ", cmd);
            commands.add(line);
            return !netem && line.contains("netem") ? new CommandRunner.Result(2, NO_NETEM) : new CommandRunner.Result(0, "");
        };
    }

    private NamespaceHostLinks links(boolean netem) throws Exception {
        return NamespaceHostLinks.read(Files.writeString(dir.resolve("hosts.yaml"), HOSTS), recording(netem));
    }

    private static Grid demo() throws Exception {
        return SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
    }

    private static RunScenario load(String faults, HostLinks links) throws Exception {
        String yaml = "siteId: demo-site\ndurationS: 600\nfaults:\n" + faults;
        return RunScenarioLoader.load("s.yaml", new StringReader(yaml), EventTypeRegistry.physics(), demo(), links);
    }

    @Test
    void shouldCutAndRestoreTheLinkBetweenTwoHostsWithIpLinkDownAndUp() throws Exception {
        NamespaceHostLinks links = links(false);
        NetworkFault cut = new NetworkFault.Partition();

        assertThat(links.cannotApply(cut, "control-host", "plant-host")).isEmpty();
        assertThat(links.apply(cut, "control-host", "plant-host")).containsExactly("lab-hub/hub-p3");
        assertThat(links.lift(cut, "plant-host", "control-host")).containsExactly("lab-hub/hub-p3");
        assertThat(commands).containsExactly("ip -n lab-hub link show hub-p3", "ip -n lab-hub link set hub-p3 down",
                "ip -n lab-hub link set hub-p3 up");
    }

    @Test
    void shouldPutANetemQdiscOnTheLinkWhereTheKernelOffersIt() throws Exception {
        NamespaceHostLinks links = links(true);
        NetworkFault lag = new NetworkFault.DelayLoss(150, 20, 0.05);

        assertThat(links.cannotApply(lag, "plant-host", "control-host")).isEmpty();
        links.apply(lag, "plant-host", "control-host");
        links.lift(lag, "plant-host", "control-host");
        assertThat(commands).containsExactly("ip -n lab-hub link show hub-p3",
                "tc -n lab-hub qdisc replace dev hub-p3 root netem delay 0ms", "tc -n lab-hub qdisc del dev hub-p3 root",
                "tc -n lab-hub qdisc replace dev hub-p3 root netem delay 150ms 20ms loss 5.0000%",
                "tc -n lab-hub qdisc del dev hub-p3 root");
    }

    @Test
    void shouldRefuseADelayLossFaultAtItsLineWhenTheKernelHasNoNetem() throws Exception {
        String faults = "  - {id: lag, type: linkDelayLoss, targets: [plant-host, control-host], startS: 10, endS: 70, delayMs: 200}\n";

        assertThatThrownBy(() -> load(faults, links(false))).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:").hasMessageContaining("fault lag (linkDelayLoss) cannot be applied here:"
                        + " this kernel offers no netem qdisc for delay and loss (tc said: " + NO_NETEM + ")");
    }

    @Test
    void shouldRefuseAPartitionNamingAHostTheRunDoesNotKnow() throws Exception {
        String faults = "  - {id: cut, type: partition, targets: [plant-host, control-host], startS: 10, endS: 70}\n";

        assertThatThrownBy(() -> load(faults, HostLinks.NONE)).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("s.yaml:4:").hasMessageContaining("unknown host 'plant-host' (the run's hosts file"
                        + " names none: give the plant --hosts FILE)");
        String one = "  - {id: cut, type: partition, target: plant-host, startS: 10, endS: 70}\n";
        assertThatThrownBy(() -> load(one, links(false))).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("names the two hosts at the ends of the link, got 1 target(s)");
        String unlinked = "  - {id: cut, type: partition, targets: [plant-host, unit-host], startS: 10, endS: 70}\n";
        assertThatThrownBy(() -> load(unlinked, links(false))).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("the hosts file names no link between plant-host and unit-host");
    }

    @Test
    void shouldRefuseAHostsFileWithAnUnknownHostAtItsLine() throws Exception {
        Path bad = Files.writeString(dir.resolve("bad.yaml"), """
                hosts: [plant-host, control-host]
                links:
                  - {between: [plant-host, far-host], interfaces: [p3]}
                """);

        assertThatThrownBy(() -> NamespaceHostLinks.read(bad, recording(false))).isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("bad.yaml:3:").hasMessageContaining("unknown host 'far-host'");
    }

    @Test
    void shouldJournalTheLinksAPartitionCutAndHealedAndWhenItCouldNot() throws Exception {
        RunScenario run = load("  - {id: cut, type: partition, targets: [plant-host, control-host], startS: 10, endS: 70}\n",
                links(false));
        List<String> told = new ArrayList<>();
        FaultObserver observer = new FaultObserver() {
            @Override
            public void networkFault(long tMs, FaultSpec spec, String action, List<String> links, String detail) {
                told.add(tMs / 1000 + " " + action + " " + links + " " + detail);
            }
        };
        for (boolean linksFail : new boolean[] {false, true}) {
            VirtualClock clock = new VirtualClock(0);
            FaultEngine engine = new FaultEngine(clock, 0, observer);
            engine.useHostLinks(linksFail ? NamespaceHostLinks.read(dir.resolve("hosts.yaml"),
                    cmd -> new CommandRunner.Result(1, "Cannot find device \"hub-p3\"")) : links(false));
            assertThat(engine.schedule(run.faults().get(0))).isEqualTo(Optional.empty());
            for (int s = 0; s <= 80; s++) {
                engine.update();
                clock.advanceMillis(1000);
            }
        }
        assertThat(told).containsExactly("10 partition [lab-hub/hub-p3] ", "70 partitionLifted [lab-hub/hub-p3] ",
                "10 notApplied [] ip -n lab-hub link set hub-p3 down failed (exit 1): Cannot find device \"hub-p3\"",
                "70 notLifted [] ip -n lab-hub link set hub-p3 up failed (exit 1): Cannot find device \"hub-p3\"");
        assertThat(TargetCatalog.of(demo()).withHosts(links(false).hosts())
                .resolve("control-host", FaultLibrary.standard().type("partition").orElseThrow().targetKinds()).problem())
                .isNull();
    }
}
