package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringReader;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class ControlCommandTest {
    private static final String SITE = "../config/sites/demo-site.yaml";
    /** TEST-NET-1 (RFC 5737): never routed, so nothing is reached even if a check failed */
    private static final String REMOTE = "tcp://192.0.2.10:1883";

    private static int run(String typed, String... args) {
        ControlCommand c = new ControlCommand();
        c.consoleIn = new StringReader(typed);
        CommandLine cli = new CommandLine(c);
        cli.setErr(new PrintWriter(new StringWriter()));
        return cli.execute(args);
    }

    @Test
    void shouldAskForTheTypedSiteIdBeforeALivePlantAndStopOnAnythingElse() {
        assertThat(run("", "--site", SITE, "--broker", REMOTE)).as("without --live-plant").isEqualTo(2);
        assertThat(run("yes\n", "--site", SITE, "--broker", REMOTE, "--live-plant")).isEqualTo(3);
        assertThat(run("", "--site", SITE, "--broker", REMOTE, "--live-plant")).as("no answer").isEqualTo(3);
        // the right site id passes the confirmation; the missing auth then refuses the start (2), no connection
        assertThat(run("demo-site\n", "--site", SITE, "--broker", REMOTE, "--live-plant")).isEqualTo(2);
    }

    /** Runs the command with System.err captured (the command prints its refusals there). */
    private static String stderrOf(String... args) {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        PrintStream saved = System.err;
        System.setErr(new PrintStream(err, true, StandardCharsets.UTF_8));
        try {
            run("", args);
        } finally {
            System.setErr(saved);
        }
        return err.toString(StandardCharsets.UTF_8);
    }

    @Test
    void shouldTakeABrokerNodeListAsLoopbackOnlyWhenEveryNodeIs() {
        // --username without --password-file: refused at the auth step, after the loopback check, before any connection
        String allLoopback = stderrOf("--site", SITE, "--broker", "tcp://127.0.0.1:1883,tcp://[::1]:1884",
                "--username", "ctl");
        assertThat(allLoopback).doesNotContain("not loopback").contains("--username ctl needs --password-file");
        String oneRemote = stderrOf("--site", SITE, "--broker", "tcp://127.0.0.1:1883," + REMOTE, "--username", "ctl");
        assertThat(oneRemote).contains("refusing broker").contains("(not loopback)");
    }
}
