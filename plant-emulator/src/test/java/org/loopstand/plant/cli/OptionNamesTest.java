package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;

/** One set of option names across commands, the old spellings still taken for one release (README, "Option names"). */
class OptionNamesTest {
    private static <T> T parsed(String command, String... args) {
        CommandLine cl = new CommandLine(new PlantCli());
        List<String> all = new ArrayList<>(List.of(command));
        all.addAll(List.of(args));
        cl.parseArgs(all.toArray(String[]::new));
        return cl.getSubcommands().get(command).getCommand();
    }

    @Test
    void shouldTakeTheBrokerPortUnderItsSharedNameAndItsOldOne() {
        BrokerCommand now = parsed("broker", "--broker-port", "1999");
        BrokerCommand old = parsed("broker", "--port", "1998");
        assertThat(now.port).isEqualTo(1999);
        assertThat(old.port).isEqualTo(1998);
    }

    @Test
    void shouldReadTheFaultToolsSiteIdFromTheSiteFileLikeEveryOtherCommand() throws Exception {
        List<String> err = new ArrayList<>();
        FaultCommand file = parsed("fault", "--site", "../config/sites/three-area.yaml");
        assertThat(file.resolvedSiteId(err::add)).isEqualTo("three-area");
        FaultCommand id = parsed("fault", "--site-id", "rig-7");
        assertThat(id.resolvedSiteId(err::add)).isEqualTo("rig-7");
        FaultCommand none = parsed("fault");
        assertThat(none.resolvedSiteId(err::add)).isEqualTo("demo-site");
        assertThat(err).isEmpty();
        FaultCommand oldUse = parsed("fault", "--site", "rig-8");
        assertThat(oldUse.resolvedSiteId(err::add)).isEqualTo("rig-8");
        assertThat(err).singleElement().asString().startsWith("deprecated: fault --site takes the site file now");
    }
}
