package org.loopstand.controller.cycle;

import org.loopstand.controller.schedule.AreaSchedule;

import org.loopstand.controller.intake.AreaCycleInputs;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;

/**
 * The controller's cycle closing the loop around a small linear two-area model written here (not
 * the project's plant emulator): the two-area worked example (Saadat, Power System
 * Analysis, ch. 12 worked example, from memory; 1000 MW base, 60 Hz; R1 = 0.05, D1 = 0.6, H1 = 5;
 * R2 = 0.0625, D2 = 0.9, H2 = 4; synchronizing coefficient 2.0 pu), with tie-line bias control and
 * bias = β (same sources; bias near β is the textbook setting): frequency and tie flow return to schedule and area 1 alone
 * picks up its 187.5 MW load step.
 */
class ClosedLoopTwoAreaTest {
    private static final double BASE_MW = 1000;
    private static final double F0 = 60;
    private static final double DT_S = 0.01;
    private static final long CYCLE_MS = 4000;

    // model state (per unit on 1000 MW, frequency deviation per unit of 60 Hz)
    private final double[] h = {5, 4};
    private final double[] d = {0.6, 0.9};
    private final double[] r = {0.05, 0.0625};
    private final double ps = 2.0;
    private final double turbineTimeS = 0.5;
    private final double[] df = new double[2];
    private final double[] pm = new double[2];
    private final double[] prefMw = {500, 500};
    private final double[] pulseRateMwPerMin = {600, 600};
    private final double[] pulseEndS = new double[2];
    private final double[] pulseSign = new double[2];
    private double tieDeltaPu;
    private final double[] loadStepPu = new double[2];

    private void step() {
        for (int i = 0; i < 2; i++) {
            if (pulseEndS[i] > 0) {
                double move = Math.min(DT_S, pulseEndS[i]);
                prefMw[i] += pulseSign[i] * pulseRateMwPerMin[i] / 60.0 * move;
                pulseEndS[i] -= move;
            }
        }
        double[] tieOut = {tieDeltaPu, -tieDeltaPu};
        for (int i = 0; i < 2; i++) {
            double prefPu = (prefMw[i] - 500) / BASE_MW;
            double dpm = (prefPu - df[i] / r[i] - pm[i]) / turbineTimeS;
            double ddf = (pm[i] - loadStepPu[i] - d[i] * df[i] - tieOut[i]) / (2 * h[i]);
            pm[i] += dpm * DT_S;
            df[i] += ddf * DT_S;
        }
        tieDeltaPu += ps * 2 * Math.PI * F0 * (df[0] - df[1]) * DT_S;
    }

    @Test
    void shouldReturnFrequencyAndTieToScheduleWithDisturbedAreaPickingUpItsLoad() {
        double beta1MwPerHz = (1 / r[0] + d[0]) * BASE_MW / F0;
        double beta2MwPerHz = (1 / r[1] + d[1]) * BASE_MW / F0;
        RegulationSettings reg = RegulationSettings.builder().cycleS(4).filterTimeConstantS(4).kp(0.2)
                .integralTimeS(40).quietMw(1).assistMw(1000).build();
        AreaSetup a1 = AreaSetup.of(AreaControlSettings.builder("A1").northAmericanBias(-beta1MwPerHz / 10)
                .nominalFrequencyHz(F0).build(), reg);
        AreaSetup a2 = AreaSetup.of(AreaControlSettings.builder("A2").northAmericanBias(-beta2MwPerHz / 10)
                .nominalFrequencyHz(F0).build(), reg);
        ControlCycle cycle = new ControlCycle(new ControlCycleSettings(CYCLE_MS, List.of(a1, a2),
                new PulseSettings(100, 4000, false, 0.5), new InterlockSettings(2000, 1),
                new FollowingSettings(8000, 20, 5, 3), 500,
                // governor response 1/R on 1000 MW per 60 Hz: 333.3 and 266.7 MW/Hz
                Map.of("G1", new GovernorResponse(BASE_MW / (r[0] * F0), 0), "G2", new GovernorResponse(BASE_MW / (r[1] * F0), 0))));

        long startMs = 1_700_000_000_000L;
        int stepsPerCycle = (int) Math.round(CYCLE_MS / 1000.0 / DT_S);
        double minDfHz = 0;
        boolean flaggedEver = false;
        for (int n = 0; n < 225; n++) { // 15 minutes
            long nowMs = startMs + n * CYCLE_MS;
            if (n == 3) {
                loadStepPu[0] = 0.1875;
            }
            CycleOutcome o = cycle.step(new CycleInputs(n, nowMs, true, List.of(
                    areaInputs("A1", df[0], tieDeltaPu), areaInputs("A2", df[1], -tieDeltaPu)),
                    List.of(unit("G1", "A1", 0, nowMs), unit("G2", "A2", 1, nowMs))));
            flaggedEver |= o.following().stream().anyMatch(f -> f.flagged());
            for (PlannedCommand c : o.commands()) {
                assertThat(c.kind()).isEqualTo(CommandKind.PULSE);
                int i = c.unitId().equals("G1") ? 0 : 1;
                pulseSign[i] = c.deltaMw() > 0 ? 1 : -1;
                pulseEndS[i] = c.durationMs() / 1000.0;
            }
            for (int k = 0; k < stepsPerCycle; k++) {
                step();
                minDfHz = Math.min(minDfHz, df[0] * F0);
            }
        }
        // primary response alone would settle at -0.3 Hz; the first swing goes below that
        assertThat(minDfHz).isLessThan(-0.25);
        assertThat(df[0] * F0).isCloseTo(0, within(0.001));
        assertThat(df[1] * F0).isCloseTo(0, within(0.001));
        assertThat(tieDeltaPu * BASE_MW).isCloseTo(0, within(1.0));
        assertThat(pm[0] * BASE_MW).isCloseTo(187.5, within(1.5));
        assertThat(pm[1] * BASE_MW).isCloseTo(0, within(1.5));
        assertThat(flaggedEver).isFalse();
    }

    private AreaCycleInputs areaInputs(String area, double dfPu, double tieOutPu) {
        return new AreaCycleInputs(area, ValidatedValue.good(F0 * (1 + dfPu), 100),
                Map.of("T12", ValidatedValue.good(tieOutPu * BASE_MW, 100)), new AreaSchedule(0, F0), 0, 0);
    }

    private UnitState unit(String id, String area, int i, long nowMs) {
        return new UnitState(id, area, true, true, true, prefMw[i], 500 + pm[i] * BASE_MW, 0, 1000, 600,
                pulseRateMwPerMin[i], false, nowMs);
    }
}
