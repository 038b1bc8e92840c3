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
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.ExcludedUnit;
import org.loopstand.protocol.message.SuspendedArea;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;
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

    @Test
    void shouldShowTheSuspendedAreasAndExcludedUnitsWithTheirReasonsWhileTheControllerRegulatesTheRest() {
        ProgressView view = new ProgressView(700);
        ControllerStatus status = new ControllerStatus(7, 1_000_000L, "controller-1", 1L, ControllerState.REGULATING, List.of(), 7,
                List.of(new AreaAce("north-basin", 0, 0, "held"), new AreaAce("south-ridge", -3.5, -3.1, "quiet")),
                List.of(new ExcludedUnit("ridge-hydro-2", "south-ridge", "notFollowing", 12.5)),
                List.of(new SuspendedArea("north-basin", List.of("frequencyUnusable:north-basin"), "frozen 22.6 s", 1_000_000L)));
        view.onMessage(TopicTree.forSite("demo-site").controllerStatus("controller-1"), new MessageCodec().encode(status));
        assertThat(view.line()).contains("ACE=-3.5 MW")
                .contains("ctl=regulating suspended:north-basin(frequencyUnusable:north-basin) excluded:ridge-hydro-2(notFollowing)  faults=none");
    }
}
