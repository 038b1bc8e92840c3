package org.loopstand.brokernode.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class BrokerNodeCliTest {
    @Test
    void shouldTakeTheArgumentsTheLauncherPassesOnWithTheCommandNameFirst() {
        BrokerNodeCli cli = new BrokerNodeCli();
        new CommandLine(cli).parseArgs(BrokerNodeCli.withoutCommandName(new String[] {"broker-node", "--name", "n2",
                "--host", "10.0.0.2", "--peer", "10.0.0.1:61616", "--peer", "10.0.0.3:61616", "--users", "u.properties"}));
        assertThat(cli.name).isEqualTo("n2");
        assertThat(cli.host).isEqualTo("10.0.0.2");
        assertThat(cli.peers).containsExactly("10.0.0.1:61616", "10.0.0.3:61616");
        assertThat(cli.users).isEqualTo(Path.of("u.properties"));
        assertThat(cli.mqttPort).isEqualTo(1883);
        assertThat(cli.clusterPort).isEqualTo(61616);
    }

    @Test
    void shouldRefuseANetworkedNodeWithoutLoginsWithExitCode2AndSayWhy() {
        StringWriter err = new StringWriter();
        CommandLine cmd = new CommandLine(new BrokerNodeCli()).setErr(new PrintWriter(err));
        java.io.PrintStream savedErr = System.err;
        java.io.ByteArrayOutputStream captured = new java.io.ByteArrayOutputStream();
        System.setErr(new java.io.PrintStream(captured, true, java.nio.charset.StandardCharsets.UTF_8));
        int code;
        try {
            code = cmd.execute("--name", "n1", "--host", "10.0.0.1", "--peer", "10.0.0.2:61616", "--peer",
                    "10.0.0.3:61616", "--config", "../../config/broker/artemis/broker-node.xml");
        } finally {
            System.setErr(savedErr);
        }
        assertThat(code).isEqualTo(2);
        assertThat(captured.toString(java.nio.charset.StandardCharsets.UTF_8))
                .contains("broker-node: refusing to start")
                .contains("give --users FILE").contains("give --cluster-password-file FILE");
    }
}
