package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.InetAddress;
import java.net.ServerSocket;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class BrokerCommandTest {
    @Test
    void shouldBeRegisteredWithDefaultsOnLoopback1884() {
        CommandLine cli = new CommandLine(new PlantCli());
        CommandLine broker = cli.getSubcommands().get("broker");
        assertThat(broker).isNotNull();
        cli.parseArgs("broker");
        BrokerCommand cmd = broker.getCommand();
        assertThat(cmd.port).isEqualTo(1884);
        assertThat(cmd.bindAddress).isEqualTo("127.0.0.1");
    }

    @Test
    void shouldExitWithOneWhenThePortIsTaken() throws Exception {
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getByName("127.0.0.1"))) {
            CommandLine cli = new CommandLine(new PlantCli());
            cli.setErr(new PrintWriter(new StringWriter()));
            int rc = cli.execute("broker", "--port", Integer.toString(taken.getLocalPort()));
            assertThat(rc).isEqualTo(1);
        }
    }

    @Test
    void shouldRefuseANonLoopbackBindBecauseTheBrokerHasNoAuthentication() {
        for (String bind : new String[] {"0.0.0.0", "192.168.1.20", "::", "broker.example"}) {
            CommandLine cli = new CommandLine(new PlantCli());
            cli.setErr(new PrintWriter(new StringWriter()));
            assertThat(cli.execute("broker", "--bind", bind, "--port", "0")).as(bind).isEqualTo(2);
        }
    }
}
