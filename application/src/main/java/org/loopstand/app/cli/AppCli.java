package org.loopstand.app.cli;

import org.loopstand.app.campaign.CampaignCommand;
import org.loopstand.app.lockstep.LockstepStudyCommand;
import org.loopstand.app.rehearsal.RehearsalCommand;
import org.loopstand.app.replay.ReplayCommand;
import org.loopstand.plant.cli.PlantCli;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point of the commands that put the parts together: a rehearsal (plant and controller as
 * processes of their own, the controller always started by a command line), and the report and CSV
 * export of a run folder. The plant ({@code PlantCli}) and the controller ({@code ControllerCli}) keep
 * their own process entry points; the {@code ./loopstand} script routes {@code rehearse},
 * {@code report}, {@code export}, {@code campaign}, {@code replay} and {@code study --with-controller} here.
 */
@Command(name = "loopstand", mixinStandardHelpOptions = true, version = "loopstand " + PlantCli.VERSION,
        description = "Loopstand application: rehearse a controller against the plant (in real time, or in lockstep with study --with-controller), run seeded fault campaigns, replay, report and export run folders.",
        subcommands = {RehearsalCommand.class, LockstepStudyCommand.class, CampaignCommand.class, ReplayCommand.class, ReportCommand.class,
                ExportCommand.class})
public final class AppCli implements Runnable {
    @CommandLine.Spec
    private CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(System.out);
    }

    public static void main(String[] args) {
        System.exit(new CommandLine(new AppCli()).execute(args));
    }
}
