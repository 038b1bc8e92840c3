package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class CheckCommandTest {
    private static final Path SITES = Path.of("..", "config", "sites");
    private static final Path TEST_SITES = Path.of("src", "test", "resources", "sites");

    @TempDir
    Path tmp;

    private final StringWriter out = new StringWriter();

    private int check(String... args) {
        String[] full = new String[args.length + 1];
        full[0] = "check";
        System.arraycopy(args, 0, full, 1, args.length);
        return new CommandLine(new PlantCli()).setOut(new PrintWriter(out)).setErr(new PrintWriter(out)).execute(full);
    }

    @Test
    void shouldPassAShippedSiteAndItsScenarioWithTheLeastDampedMode() {
        int code = check("--site", SITES.resolve("three-area-50.yaml").toString(),
                SITES.resolve("three-area-50.yaml").toString(), "../config/scenarios/three-area-50-step.yaml");
        assertThat(code).as(out.toString()).isZero();
        assertThat(out.toString()).contains("three-area-50.yaml: site three-area-50 ok; stable: least-damped mode ",
                "three-area-50-step.yaml: scenario ok against ");
    }

    @Test
    void shouldWarnOnceAboutALightlyDampedSiteGivenAsAFileAndAsAScenariosSite() throws Exception {
        Path scenario = Files.writeString(tmp.resolve("step.yaml"), "siteId: tarnwick\ndurationS: 300\nevents:\n"
                + "  - {atS: 60, type: loadStep, area: quarry-heights, deltaMw: 60}\n");
        Path site = TEST_SITES.resolve("tarnwick.yaml");
        int code = check("--site", site.toAbsolutePath().toString(), site.toString(), scenario.toString());
        assertThat(code).as(out.toString()).isZero();
        // 2.9 % damping, under the 3 % the screen asks (SmallSignalStability.MIN_DAMPING_RATIO)
        assertThat(out.toString().split("lightly damped: least-damped mode below 3 % damping", -1)).as(out.toString())
                .hasSize(2);
        assertThat(out.toString()).contains("tarnwick.yaml: warning: lightly damped", "damping ratio 2.9 %",
                "tarnwick.yaml: site tarnwick ok; stability warning above", "step.yaml: scenario ok against ");
    }

    @Test
    void shouldRefuseTheUnstableSiteWithExitTwoNamingTheMode() {
        int code = check(TEST_SITES.resolve("unstable-three-area.yaml").toString());
        assertThat(code).isEqualTo(2);
        assertThat(out.toString()).contains("unstable-three-area.yaml: site refused by the stability screen: unstable: a mode grows",
                " Hz, damping ratio -", "areas ", "alder-fen", "unstable-three-area.yaml: refused");
    }

    @Test
    void shouldRefuseAScenarioAgainstAnUnstableSite() {
        int code = check("--site", TEST_SITES.resolve("unstable-three-area.yaml").toString(),
                TEST_SITES.resolve("unstable-three-area-step.yaml").toString());
        assertThat(code).isEqualTo(2);
        assertThat(out.toString()).contains("site refused by the stability screen", "unstable-three-area-step.yaml: refused");
    }

    @Test
    void shouldReportAScenarioProblemAtItsLineAndColumn() throws Exception {
        Path bad = tmp.resolve("bad.yaml");
        Files.writeString(bad, "site: demo-site\ndurationS: 100\nevents:\n  - {atS: 10, type: loadStep, area: nowhere, deltaMw: 5}\n");
        int code = check("--site", SITES.resolve("demo-site.yaml").toString(), bad.toString());
        assertThat(code).isEqualTo(2);
        assertThat(out.toString()).containsPattern("bad\\.yaml:4:\\d+: .*nowhere").contains("bad.yaml: refused");
    }

    @Test
    void shouldSayAPlanIsNotCheckedHere() {
        int code = check("../config/plans/quick.yaml");
        assertThat(code).isEqualTo(2);
        assertThat(out.toString()).contains("quick.yaml: looks like a unit test plan", "./loopstand pulse-test --plan FILE");
    }

    @Test
    void shouldCheckAScenariosNetworkFaultsAgainstTheHostsFileAndTheLinksOnThisMachine(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        java.nio.file.Path hosts = java.nio.file.Files.writeString(dir.resolve("hosts.yaml"), """
                hosts: [plant-host, unit-host, control-host]
                links:
                  - {between: [plant-host, control-host], namespace: lab-hub, interfaces: [hub-p3]}
                """);
        String scenario = "../config/scenarios/cross-host-partition.yaml";

        assertThat(check(scenario)).isEqualTo(2);
        assertThat(out.toString()).contains("fault control-cut: unknown host 'plant-host'");

        // with the hosts file the names are known, and the link is checked where the plant would run: this
        // machine has no namespace lab-hub, so the fault cannot be applied and the check says so
        out.getBuffer().setLength(0);
        assertThat(check("--hosts", hosts.toString(), scenario)).isEqualTo(2);
        assertThat(out.toString()).doesNotContain("unknown host")
                .contains("cross-host-partition.yaml:23:23: fault control-cut (partition) cannot be applied here:"
                        + " interface lab-hub/hub-p3 not found");
    }
}
