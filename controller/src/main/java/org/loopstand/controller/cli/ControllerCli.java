package org.loopstand.controller.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point for the control-centre side of the launcher: the controller and the unit response
 * test. The {@code ./loopstand} script routes subcommands here.
 */
@Command(name = "loopstand", mixinStandardHelpOptions = true, version = "loopstand 0.1.0",
        description = "Loopstand control side: secondary controller, unit response test, economic dispatch.",
        subcommands = {ControlCommand.class, PulseTestCommand.class, DispatchCommand.class})
public final class ControllerCli implements Runnable {
    @CommandLine.Spec
    private CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(System.out);
    }

    public static void main(String[] args) {
        System.exit(new CommandLine(new ControllerCli()).execute(args));
    }
}
