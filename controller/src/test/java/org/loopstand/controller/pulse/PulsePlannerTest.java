package org.loopstand.controller.pulse;

import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.CommandKind;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.controller.allocation.UnitState;

class PulsePlannerTest {
    private static final long NOW = 1_700_000_000_000L;

    private static UnitState unit(double setpointMw, double pulseRateMwPerMin, boolean setpoints) {
        return new UnitState("U1", "A", true, true, true, setpointMw, setpointMw, 0, 500, 60, pulseRateMwPerMin,
                setpoints, NOW);
    }

    private final PulsePlanner planner = new PulsePlanner(new PulseSettings(200, 4000, true, 0.5));

    @Test
    void shouldSizePulseFromPulseRate() {
        // 2 MW at 60 MW/min = 2/60 min = 2000 ms
        PulseOutcome p = planner.plan(unit(100, 60, false), 102, NOW, 4000);
        assertThat(p.sends()).isTrue();
        assertThat(p.command().kind()).isEqualTo(CommandKind.PULSE);
        assertThat(p.command().direction()).isEqualTo(PulseDirection.RAISE);
        assertThat(p.command().durationMs()).isEqualTo(2000);
        assertThat(p.command().validUntilMs()).isEqualTo(NOW + 4000);
        assertThat(p.command().deltaMw()).isEqualTo(2.0);
        PulseOutcome lower = planner.plan(unit(100, 60, false), 99, NOW, 4000);
        assertThat(lower.command().direction()).isEqualTo(PulseDirection.LOWER);
        assertThat(lower.command().durationMs()).isEqualTo(1000);
        assertThat(lower.command().deltaMw()).isEqualTo(-1.0);
    }

    @Test
    void shouldDropPulseBelowMinimum() {
        // 0.1 MW at 60 MW/min = 100 ms < 200 ms
        PulseOutcome p = planner.plan(unit(100, 60, false), 100.1, NOW, 4000);
        assertThat(p.sends()).isFalse();
        assertThat(p.skipReason()).isEqualTo("belowMinimum");
        assertThat(planner.plan(unit(100, 0, false), 110, NOW, 4000).skipReason()).isEqualTo("noPulseRate");
    }

    @Test
    void shouldCutPulseAtMaximum() {
        // 10 MW at 60 MW/min = 10 s -> 4 s, which moves 4 MW
        PulseOutcome p = planner.plan(unit(100, 60, false), 110, NOW, 4000);
        assertThat(p.clipped()).isTrue();
        assertThat(p.command().durationMs()).isEqualTo(4000);
        assertThat(p.command().deltaMw()).isEqualTo(4.0);
    }

    @Test
    void shouldSendSetpointToUnitThatAcceptsIt() {
        PulseOutcome p = planner.plan(unit(100, 60, true), 103.5, NOW, 4000);
        assertThat(p.command().kind()).isEqualTo(CommandKind.SETPOINT);
        assertThat(p.command().setpointMw()).isEqualTo(103.5);
        assertThat(p.command().direction()).isNull();
        assertThat(p.command().durationMs()).isZero();
        assertThat(planner.plan(unit(100, 60, true), 100.2, NOW, 4000).sends()).isFalse();
    }
}
