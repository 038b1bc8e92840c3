package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.UnitTelemetry;

/**
 * A real-time plant whose physics lags its clock: measurements carry the time of the physics state they
 * were read from, the clock's ticks the clock's time. Deterministic: a virtual clock moved by hand, one
 * loop pass steps at most {@link PlantAgent#MAX_STEPS_PER_CYCLE} physics steps, so a 20 s jump of the
 * clock leaves the physics behind.
 */
class PhysicsTimeStampsTest {
    static final long T0 = 1_700_000_000_000L;
    final PlantAgentTest base = new PlantAgentTest();

    @Test
    void shouldStampMetersAndTelemetryWithThePhysicsTimeWhenThePhysicsLagsTheClock() throws Exception {
        try (PlantRunner p = base.plant(ConnectionGrouping.PER_UNIT, Set.of())) {
            base.run(p, 10);
            assertThat(p.sim().stepS()).isEqualTo(0.02); // the demo site's step (StepSizeRule ladder)
            String north = base.topics.areaMeter("north-basin", "main");
            String south = base.topics.areaMeter("south-ridge", "main");
            String hydro = base.topics.unitTelemetry("ridge-hydro-1");
            // in step: a reading's time is the physics' time, which is the clock's (T0 + 10 s)
            assertThat(last(base.decoded(north, AreaMeter.class)).sourceTime()).isEqualTo(T0 + 10_000);
            assertThat(last(base.decoded(hydro, UnitTelemetry.class)).sourceTime()).isEqualTo(T0 + 10_000);
            int northBefore = base.on(north).size();
            int southBefore = base.on(south).size();
            int hydroBefore = base.on(hydro).size();

            base.clock.advanceMillis(20_000); // a 20 s stall: one pass catches up 250 steps = 5 s
            p.agent().doWork();

            assertThat(p.sim().timeS()).isEqualTo(15.0, org.assertj.core.api.Assertions.within(1e-9));
            long clockNowMs = base.clock.epochMillis();
            assertThat(clockNowMs).isEqualTo(T0 + 30_000);
            AreaMeter n = last(base.decoded(north, AreaMeter.class));
            AreaMeter s = last(base.decoded(south, AreaMeter.class));
            assertThat(base.on(north)).hasSize(northBefore + 1);
            assertThat(base.on(south)).hasSize(southBefore + 1);
            // the meters scan after the pass's steps: the state at 15 s, 15 s older than the clock
            assertThat(n.sourceTime()).isEqualTo(T0 + 15_000);
            assertThat(s.sourceTime()).isEqualTo(T0 + 15_000);
            assertThat(clockNowMs - n.sourceTime()).isEqualTo(15_000);
            // the unit's scan fell due on the clock after the pass's first step: the state at 10.02 s
            assertThat(base.on(hydro)).hasSize(hydroBefore + 1);
            assertThat(last(base.decoded(hydro, UnitTelemetry.class)).sourceTime()).isEqualTo(T0 + 10_020);
            // the clock's own tick keeps the clock's time; its scenario time says where the physics is
            ClockTick tick = last(base.decoded(base.topics.clock(), ClockTick.class));
            assertThat(tick.sourceTime()).isEqualTo(clockNowMs);
            assertThat(tick.scenarioTimeMs()).isEqualTo(15_000);
        }
    }

    static <T> T last(List<T> l) {
        return l.get(l.size() - 1);
    }
}
