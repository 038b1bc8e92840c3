package org.loopstand.plant.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point of the plant process: every subcommand that runs physics, the plant on the bus or the
 * embedded broker. The {@code ./loopstand} script routes these subcommands here; the commands that
 * put plant and controller together (rehearse, report, export) live in the application module.
 */
@Command(name = "loopstand", mixinStandardHelpOptions = true, version = "loopstand 0.1.0",
        description = "Loopstand plant side: embedded broker, plant emulator, study mode.",
        subcommands = {BrokerCommand.class, StudyCommand.class, CheckCommand.class, PlantCommand.class, UnitCommand.class, FaultCommand.class})
public final class PlantCli implements Runnable {
    /** The project version, as shown by --version and written into journals and reports. */
    public static final String VERSION = "0.1.0";

    @CommandLine.Spec
    private CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(System.out);
    }

    public static void main(String[] args) {
        System.exit(new CommandLine(new PlantCli()).execute(args));
    }
}
