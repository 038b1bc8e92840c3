package org.loopstand.plant.cli;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.ScenarioEvent;

/** The extras of the plant journal's header: what the report needs to judge any controller (docs/report.md). */
public final class PlantJournalHeader {
    private PlantJournalHeader() {
    }

    public static Map<String, Object> of(Grid grid, Path siteFile, Path scenarioFile, Scenario scenario, List<ScenarioEvent> events,
                                  double rate, long seed, String uri, boolean embedded, PlantOptions options, GridSimulator sim,
                                  long meterScanMs) {
        Map<String, Object> header = new LinkedHashMap<>();
        header.put("site", grid.siteId());
        header.put("siteFile", siteFile.getFileName().toString());
        header.put("scenario", scenarioFile == null ? null : scenarioFile.getFileName().toString());
        header.put("scenarioDurationS", scenario == null ? null : scenario.durationS());
        header.put("rate", rate);
        header.put("seed", seed);
        header.put("scenarioSeed", scenario == null ? null : scenario.seed());
        header.put("broker", uri);
        header.put("embeddedBroker", embedded);
        header.put("grouping", options.grouping().cliName());
        header.put("stepS", sim.stepS());
        header.put("meterScanMs", meterScanMs);
        header.put("loopstandVersion", PlantCli.VERSION);
        header.put("javaVersion", System.getProperty("java.version"));
        header.put("areas", areas(grid));
        Map<String, String> unitAreas = new LinkedHashMap<>();
        grid.units().forEach(u -> unitAreas.put(u.id(), u.area()));
        header.put("units", unitAreas);
        header.put("events", events.stream().map(e -> e.type() + "@" + PlantCommand.trim(e.atS()) + "s").toList());
        return header;
    }

    /** Per area what the report needs: nominal frequency, bias β (MW/Hz, positive), scheduled net interchange. */
    static Map<String, Object> areas(Grid grid) {
        Map<String, Object> out = new LinkedHashMap<>();
        for (Area a : grid.areas()) {
            double beta = !Double.isNaN(a.kMwPerHz()) ? a.kMwPerHz() : -10.0 * a.biasMwPer01Hz();
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("nominalFrequencyHz", a.nominalFrequencyHz());
            m.put("betaMwPerHz", Double.isFinite(beta) ? beta : null);
            m.put("scheduledNetInterchangeMw", grid.scheduledNetInterchangeMw(a.id()));
            out.put(a.id(), m);
        }
        return out;
    }
}
