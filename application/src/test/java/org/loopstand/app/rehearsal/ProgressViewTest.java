package org.loopstand.app.rehearsal;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.plant.cli.FaultAnnouncer;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.time.VirtualClock;
import org.junit.jupiter.api.Test;

class ProgressViewTest {
    @Test
    void shouldShowAScenarioFaultOnlyWhileThePlantSaysItIsActive() throws Exception {
        Grid grid = SiteLoader.load(java.nio.file.Path.of("..", "config", "sites", "demo-site.yaml"));
        VirtualClock clock = new VirtualClock(1_000_000L);
        List<String> plantLines = new ArrayList<>();
        FaultEngine engine = new FaultEngine(clock, clock.epochMillis(), new FaultAnnouncer(plantLines::add));
        FaultSpec freeze = FaultSpec.builder(FaultLibrary.standard(), TargetCatalog.of(grid))
                .id("nb-freeze").type("freezeValue").target("north-basin").window(10, 20).build();
        assertThat(engine.schedule(freeze)).isEmpty();
        ProgressView view = new ProgressView(60);

        clock.advanceMillis(12_000);
        engine.update();
        plantLines.forEach(view::onPlantLine);
        assertThat(view.line()).endsWith("faults=freezeValue:nb-freeze");

        clock.advanceMillis(10_000);
        engine.update();
        plantLines.forEach(view::onPlantLine);
        assertThat(plantLines).containsExactly("plant: fault active freezeValue:nb-freeze (scenario)",
                "plant: fault ended freezeValue:nb-freeze (window ended)");
        assertThat(view.line()).endsWith("faults=none");
    }
}
