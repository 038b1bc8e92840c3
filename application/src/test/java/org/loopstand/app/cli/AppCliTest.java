package org.loopstand.app.cli;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.cli.PlantCli;
import picocli.CommandLine;

/** The application holds the commands that put the parts together; the plant process keeps its own. */
class AppCliTest {
    @Test
    void shouldHoldRehearseReplayReportExportTheLockstepStudyAndCampaignsAndLeaveThemOutOfThePlantProcess() {
        assertThat(new CommandLine(new AppCli()).getSubcommands()).containsOnlyKeys("rehearse", "study", "campaign", "replay", "report", "export");
        assertThat(new CommandLine(new PlantCli()).getSubcommands()).doesNotContainKeys("rehearse", "report", "export", "campaign", "replay")
                .containsKeys("plant", "study", "broker", "unit", "fault", "check");
    }

    @Test
    void shouldTakeTheEmbeddedBrokersPortUnderItsSharedNameAndItsOldOne() {
        CommandLine now = new CommandLine(new AppCli());
        now.parseArgs("rehearse", "--broker-port", "1999");
        CommandLine old = new CommandLine(new AppCli());
        old.parseArgs("rehearse", "--port", "1998");
        assertThat(now.getSubcommands().get("rehearse").getCommandSpec().findOption("--broker-port").<Integer>getValue())
                .isEqualTo(1999);
        assertThat(old.getSubcommands().get("rehearse").getCommandSpec().findOption("--broker-port").<Integer>getValue())
                .isEqualTo(1998);
    }
}
