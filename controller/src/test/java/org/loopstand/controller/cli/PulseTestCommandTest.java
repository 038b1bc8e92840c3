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

    @Test
    void shouldRefuseEveryCapThatIsNotAFiniteNumberWithinThePlansAsAUsageError() {
        // quick.yaml caps 20 MW and 900 s; nothing is connected to: the caps are checked first
        String[][] bad = {{"--max-excursion-mw", "NaN"}, {"--max-excursion-mw", "Infinity"},
                {"--max-excursion-mw", "-Infinity"}, {"--max-excursion-mw", "-5"}, {"--max-excursion-mw", "0"},
                {"--max-excursion-mw", "1e9"}, {"--max-excursion-mw", "20.5"}, {"--max-duration-s", "NaN"},
                {"--max-duration-s", "Infinity"}, {"--max-duration-s", "-1"}, {"--max-duration-s", "901"}};
        for (String[] b : bad) {
            java.io.ByteArrayOutputStream err = new java.io.ByteArrayOutputStream();
            java.io.PrintStream saved = System.err;
            int code;
            System.setErr(new java.io.PrintStream(err, true, java.nio.charset.StandardCharsets.UTF_8));
            try {
                code = new CommandLine(new ControllerCli()).execute("pulse-test", "--unit", "basin-steam-1",
                        "--site", "../config/sites/demo-site.yaml", "--plan", "../config/plans/quick.yaml",
                        "--broker", "tcp://127.0.0.1:1", b[0], b[1]);
            } finally {
                System.setErr(saved);
            }
            String range = b[0].equals("--max-excursion-mw") ? "(0, 20.00] MW" : "(0, 900.00] s";
            assertThat(code).as("%s %s", b[0], b[1]).isEqualTo(2);
            assertThat(err.toString(java.nio.charset.StandardCharsets.UTF_8)).as("%s %s", b[0], b[1])
                    .contains(b[0] + " must be a finite number in " + range);
        }
    }
}
