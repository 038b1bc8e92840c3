package org.loopstand.plant.cli;

import org.loopstand.plant.rehearsal.RehearsalCommand;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point for the plant side of the launcher: every subcommand that runs physics, the plant on
 * the bus or the embedded broker. The {@code ./loopstand} script routes subcommands here.
 */
@Command(name = "loopstand", mixinStandardHelpOptions = true, version = "loopstand 0.1.0",
        description = "Loopstand plant side: embedded broker, plant emulator, study mode.",
        subcommands = {BrokerCommand.class, StudyCommand.class, CheckCommand.class, PlantCommand.class, UnitCommand.class, FaultCommand.class,
                RehearsalCommand.class, ReportCommand.class, ExportCommand.class})
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
