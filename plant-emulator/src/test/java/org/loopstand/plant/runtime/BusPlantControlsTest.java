package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/** A scenario's mode change reaches a unit interface that runs in a process of its own, not only the plant's own. */
class BusPlantControlsTest {
    private static final String UNIT = "basin-gas-1";

    @Test
    void shouldSendAModeChangeForAUnitThatRunsElsewhereAsTheOperatorsOrder() throws Exception {
        Grid grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        VirtualClock clock = new VirtualClock(1_800_000_000_000L);
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        TopicTree topics = TopicTree.forSite("demo-site");
        PhysicsEpoch epoch = new PhysicsEpoch(new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 1, 10.5));
        epoch.startAt(clock.epochMillis());
        // the plant runs no unit interface itself (--no-units): the unit is a process of its own
        BusPlantControls controls = new BusPlantControls(clock, epoch, broker.connect("demo-site-plant"), topics,
                new MessageCodec(), List.of());
        UnitProcess unit = new UnitProcess("demo-site", grid.units().get(grid.unitIndex(UNIT)), InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, broker::connect, clock);
        assertThat(unit.unitInterface().controlMode()).isEqualTo(ControlMode.REMOTE);

        controls.setControlMode(UNIT, ControlMode.LOCAL, "scenario event modeChange");
        unit.agent().doWork(); // the unit process applies queued orders on its own thread

        assertThat(unit.unitInterface().controlMode()).isEqualTo(ControlMode.LOCAL);
        controls.setControlMode(UNIT, ControlMode.REMOTE, "scenario event modeChange");
        unit.agent().doWork();
        assertThat(unit.unitInterface().controlMode()).isEqualTo(ControlMode.REMOTE);
        unit.close();
    }
}
