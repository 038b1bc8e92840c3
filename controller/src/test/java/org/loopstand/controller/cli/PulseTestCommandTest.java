package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class PulseTestCommandTest {
    @Test
    void shouldRefuseANonTestBrokerWithoutLivePlantBeforeConnecting() {
        // 192.0.2.1 is a documentation address (TEST-NET-1): never contacted, the gate refuses first.
        int code = new CommandLine(new ControllerCli()).execute("pulse-test", "--unit", "basin-steam-1",
                "--site", "../config/sites/demo-site.yaml", "--plan", "../config/plans/quick.yaml",
                "--broker", "tcp://192.0.2.1:1883");
        assertThat(code).isEqualTo(3);
    }

    @Test
    void shouldRefuseAnUnknownUnit() {
        int code = new CommandLine(new ControllerCli()).execute("pulse-test", "--unit", "no-such-unit",
                "--site", "../config/sites/demo-site.yaml", "--plan", "../config/plans/quick.yaml");
        assertThat(code).isEqualTo(2);
    }
}
