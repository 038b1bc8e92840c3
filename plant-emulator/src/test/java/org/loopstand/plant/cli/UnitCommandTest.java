package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class UnitCommandTest {
    private static final String SITE = "../config/sites/demo-site.yaml";

    /** Runs {@code unit} with System.err captured (the command prints there); returns rc and what it printed. */
    private static String[] run(UnitCommand command, String... args) {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        PrintStream saved = System.err;
        System.setErr(new PrintStream(err, true, StandardCharsets.UTF_8));
        try {
            CommandLine cli = new CommandLine(command);
            cli.setErr(new PrintWriter(new StringWriter()));
            int rc = cli.execute(args);
            return new String[] {Integer.toString(rc), err.toString(StandardCharsets.UTF_8)};
        } finally {
            System.setErr(saved);
        }
    }

    private static int closedLoopbackPort() throws Exception {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getByName("127.0.0.1"))) {
            return s.getLocalPort();
        }
    }

    @Test
    void shouldKeepItsOwnClockByDefaultAndRefuseAnUnknownClockMode() {
        UnitCommand c = new UnitCommand();
        new CommandLine(c).parseArgs("--site", SITE, "--unit", "basin-steam-1", "--broker", "tcp://127.0.0.1:1");
        assertThat(c.clockMode).isEqualTo("own");
        String[] r = run(new UnitCommand(), "--site", SITE, "--unit", "basin-steam-1", "--broker", "tcp://127.0.0.1:1",
                "--clock", "plant");
        assertThat(r[0]).isEqualTo("2");
        assertThat(r[1]).contains("--clock must be own or bus, got 'plant'");
    }

    @Test
    void shouldStopWithoutStartingTheUnitWhenThePlantsClockTopicStaysSilent() throws Exception {
        UnitCommand c = new UnitCommand();
        c.plantTickTimeoutMs = 300;
        String[] r = run(c, "--site", SITE, "--unit", "basin-steam-1", "--broker",
                "tcp://127.0.0.1:" + closedLoopbackPort(), "--clock", "bus");
        assertThat(r[0]).isEqualTo("4");
        assertThat(r[1]).contains("no fresh tick on").contains("within 0.3 s").doesNotContain("unit: basin-steam-1 of site");
    }
}
