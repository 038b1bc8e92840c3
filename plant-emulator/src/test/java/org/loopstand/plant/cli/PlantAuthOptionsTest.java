package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

/** The plant-side commands refuse to start without auth off loopback, before connecting anywhere. */
class PlantAuthOptionsTest {
    static final String SITE = Path.of("..", "config", "sites", "demo-site.yaml").toString();

    private static String run(Callable<Integer> command, int expectedExit, String... args) {
        PrintStream err = System.err;
        ByteArrayOutputStream captured = new ByteArrayOutputStream();
        System.setErr(new PrintStream(captured, true, StandardCharsets.UTF_8));
        try {
            assertThat(new CommandLine(command).execute(args)).isEqualTo(expectedExit);
        } finally {
            System.setErr(err);
        }
        return captured.toString(StandardCharsets.UTF_8);
    }

    @Test
    void shouldRefuseAPlantOrUnitOnANonLoopbackBrokerWithoutAuth() {
        assertThat(run(new PlantCommand(), 2, "--site", SITE, "--broker", "tcp://10.1.2.3:1883"))
                .contains("refusing to start").contains("no broker username/password");
        assertThat(run(new UnitCommand(), 2, "--site", SITE, "--unit", "ridge-hydro-1", "--broker", "tcp://10.1.2.3:1883",
                "--insecure")).contains("--insecure is allowed only with a loopback broker");
    }

    @Test
    void shouldRefuseSharedConnectionsUnderBrokerAuth() throws Exception {
        Path pw = java.nio.file.Files.writeString(java.nio.file.Files.createTempDirectory("pa").resolve("users"),
                "plant = a-long-enough-password\n");
        Path keys = java.nio.file.Files.writeString(pw.resolveSibling("keys"),
                "ridge-hydro-1.k1 = " + java.util.Base64.getEncoder().encodeToString(new byte[32]) + "\n");
        assertThat(run(new PlantCommand(), 2, "--site", SITE, "--broker", "tcp://127.0.0.1:1", "--grouping", "pooled",
                "--credentials-file", pw.toString(), "--keys", keys.toString()))
                .contains("--grouping pooled shares one connection");
    }
}
