package org.loopstand.plant.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.time.VirtualClock;

class ScenarioEngineTest {
    private static final Path CONFIG = Path.of("..", "config");
    private static final double STEP_S = 0.05;

    private static Grid demo() throws Exception {
        return SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
    }

    private static RunScenario tripScenario(Grid grid) throws Exception {
        return RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-unit-trip.yaml"), EventTypeRegistry.physics(), grid);
    }

    private static ScenarioEngine engine(Grid grid, RunScenario rs, VirtualClock clock, RunRecord record, double endS) {
        GridSimulator sim = new GridSimulator(grid, STEP_S, rs.scenario().seed(), rs.scenario().startHourOfDay());
        return new ScenarioEngine(sim, clock, rs.scenario().events()).endAt(endS).recordInto(record, 1.0);
    }

    @Test
    void shouldGiveTheSameRunInRealTimeCyclesAsInLockstep() throws Exception {
        Grid grid = demo();
        RunScenario rs = tripScenario(grid);
        VirtualClock lockClock = new VirtualClock(0);
        ScenarioEngine lockstep = engine(grid, rs, lockClock, new RunRecord(0), 300);
        lockstep.runToEnd(lockClock, new ScenarioEngine.StepHook() { });

        VirtualClock wall = new VirtualClock(0);
        ScenarioEngine realTime = engine(grid, rs, wall, new RunRecord(0), 300);
        int cycles = 0;
        while (!realTime.ended()) {
            wall.advanceNanos(137_000_000L); // an uneven loop period: 2 or 3 steps due per cycle
            realTime.catchUp(250, new ScenarioEngine.StepHook() { });
            cycles++;
        }
        assertThat(realTime.grid().stepCount()).isEqualTo(6000).isEqualTo(lockstep.grid().stepCount());
        assertThat(realTime.grid().frequencyHz(0)).isEqualTo(lockstep.grid().frequencyHz(0));
        assertThat(realTime.eventsFired()).isEqualTo(lockstep.eventsFired()).isPositive();
        assertThat(cycles).isEqualTo((int) Math.ceil(300.05e9 / 137e6)); // the step due at 300.05 s finds the end
        List<String> a = realTime.decideChecks(rs.checks()).stream().map(CheckOutcome::toString).toList();
        List<String> b = lockstep.decideChecks(rs.checks()).stream().map(CheckOutcome::toString).toList();
        assertThat(a).isEqualTo(b).hasSize(rs.checks().size());
    }

    @Test
    void shouldTakeOnlyTheStepsTheClockSaysAreDueAndAtMostTheCap() throws Exception {
        Grid grid = demo();
        VirtualClock wall = new VirtualClock(0);
        ScenarioEngine e = engine(grid, tripScenario(grid), wall, new RunRecord(0), 300);
        List<Long> lateness = new ArrayList<>();
        ScenarioEngine.StepHook hook = new ScenarioEngine.StepHook() {
            @Override
            public void stepped(long latenessNanos) {
                lateness.add(latenessNanos);
            }
        };
        wall.advanceNanos(49_000_000L);
        assertThat(e.catchUp(250, hook)).isZero();
        wall.advanceNanos(1_000_000L + 1_000_000_000L); // 1.05 s: 21 steps due
        assertThat(e.catchUp(5, hook)).isEqualTo(5);
        assertThat(e.catchUp(250, hook)).isEqualTo(16);
        // the first step was due at 0.05 s and ran at 1.05 s: 1 s late; the last ran on time
        assertThat(lateness.get(0)).isEqualTo(1_000_000_000L);
        assertThat(lateness.get(20)).isZero();
    }

    @Test
    void shouldSampleTheTruthAtTheStartAndEverySecond() throws Exception {
        Grid grid = demo();
        VirtualClock clock = new VirtualClock(0);
        RunRecord record = new RunRecord(0);
        engine(grid, tripScenario(grid), clock, record, 10).runToEnd(clock, new ScenarioEngine.StepHook() { });
        RunRecord.Series f = record.series("frequencyHz/north-basin");
        assertThat(f.size()).isEqualTo(11);
        assertThat(f.timeS(0)).isZero();
        assertThat(f.timeS(10)).isCloseTo(10.0, org.assertj.core.data.Offset.offset(1e-9));
    }

    @Test
    void shouldRefuseALockstepRunWithoutAnEndOrOnAnotherClock() throws Exception {
        Grid grid = demo();
        VirtualClock clock = new VirtualClock(0);
        GridSimulator sim = new GridSimulator(grid, STEP_S, 1, 0);
        ScenarioEngine e = new ScenarioEngine(sim, clock, List.of());
        assertThatThrownBy(() -> e.runToEnd(clock, new ScenarioEngine.StepHook() { }))
                .hasMessageContaining("needs an end time");
        e.endAt(1);
        assertThatThrownBy(() -> e.runToEnd(new VirtualClock(0), new ScenarioEngine.StepHook() { }))
                .hasMessageContaining("engine's own clock");
    }
}
