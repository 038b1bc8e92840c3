package org.loopstand.plant.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.function.Consumer;

import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.network.NamespaceHostLinks;
import org.loopstand.plant.profile.WireProfile;
import org.loopstand.plant.profile.WireProfileLoader;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.config.ConfigFileException;

/**
 * The files {@code loopstand plant} runs from, read and checked in one step: the site, the scenario
 * (optional) with its checks and faults, the hosts file (optional) and the wire profile (optional).
 *
 * @param rehearsal the scenario as a run (events, faults, checks), null without a scenario
 * @param scenario  its physics part, null without a scenario
 * @param profile   null without a wire profile
 */
record PlantInputs(Grid grid, RunScenario rehearsal, Scenario scenario, HostLinks hostLinks, WireProfile profile) {

    /**
     * @param quietLoads drop the site's load noise
     * @param warnings   takes each start warning (old keys, a lightly damped site, …)
     * @throws ConfigFileException naming the file, line and column of what is wrong
     * @throws IOException         a file that cannot be read
     */
    static PlantInputs read(Path site, Path scenarioFile, Path hostsFile, Path wireProfile, boolean quietLoads,
                            Consumer<String> warnings) throws ConfigFileException, IOException {
        HostLinks hostLinks = hostsFile == null ? HostLinks.NONE : NamespaceHostLinks.read(hostsFile);
        Grid grid = SiteLoader.loadForRun(site, warnings);
        if (quietLoads) {
            grid = grid.withoutLoadNoise();
        }
        RunScenario rehearsal = null;
        if (scenarioFile != null) {
            org.loopstand.protocol.config.OldKeys.SCENARIO.warn(scenarioFile, warnings);
            rehearsal = RunScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid, hostLinks);
            RunScenarioLoader.startWarnings(scenarioFile, rehearsal, grid).forEach(warnings);
        }
        WireProfile profile = wireProfile == null ? null : WireProfileLoader.load(wireProfile, grid.siteId());
        return new PlantInputs(grid, rehearsal, rehearsal == null ? null : rehearsal.scenario(), hostLinks, profile);
    }
}
