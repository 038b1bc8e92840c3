package org.loopstand.controller.pulsetest;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulsetest.analysis.Finding;
import org.loopstand.controller.pulsetest.analysis.StepMeasurement;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.plant.fault.PlantFaultFlags;

/**
 * The pulse test against the real plant of the demo site (physics, plant interface, telemetry every
 * 2 s) on the in-memory broker and a virtual clock. Unit basin-steam-1 (site file): reheat turbine,
 * governor 0.2 s, steam chest 0.3 s, reheat 7 s with 30 % high-pressure share, droop 5 % on 900 MW
 * (360 MW/Hz), dead band ±10 mHz, ramp 20 MW/min, pulse rate 18 MW/min.
 */
class PulseTestOnEmulatorTest {

    private static List<StepMeasurement> moves(PulseTestResult r) {
        return r.steps().stream().filter(s -> s.evidence().window().kind() == StepKind.STAIRCASE)
                .map(s -> s.evidence().measurement()).toList();
    }

    @Test
    void shouldMeasureTheDemoUnitsDeclaredGainRampAndDeadTime() throws Exception {
        try (EmulatorRig rig = new EmulatorRig("basin-steam-1", "quick.yaml", 10.5, 2_000, true)) {
            PulseTestResult r = rig.settle(120).run();

            assertThat(r.record().state()).isEqualTo(RunState.FINISHED);
            assertThat(r.record().acks()).hasSize(r.record().pulses().size());
            assertThat(moves(r)).hasSize(2);
            for (StepMeasurement m : moves(r)) {
                // Declared gain = pulseRateMwPerMin / 60 = 18 / 60 = 0.300 MW per pulse-second. The unit's
                // own pulse moves the interconnection's frequency: in steady state 12 MW / β with the two
                // dead-banded steam units out (1686 − 360 − 320 = 1006 MW/Hz) is 11.9 mHz, past the ±10 mHz
                // dead band, so the unit's governor gives back about 0.4 MW (gain ≈ 0.29); it can only take
                // away, never add. Held to the plan's ±10 %.
                assertThat(m.gainMwPerPulseS()).isCloseTo(0.300, within(0.030)).isLessThan(0.300);
                // Reference rate = 12 MW over 4 × 10 s pulses + 3 × 0.5 s gaps = 17.35 MW/min (below the
                // 20 MW/min ramp). The reheat lag (7 s, 70 % of the power) only slows the 10–90 % slope:
                // held to the plan's ±15 % and below the reference rate.
                assertThat(m.rampMwPerMin()).isCloseTo(17.35, within(0.15 * 17.35)).isLessThan(17.35);
                // Dead time: at least the governor + steam chest lags (0.2 + 0.3 s); at most the lag of the
                // output behind a steady reference ramp, 0.2 + 0.3 + 0.7 × 7 = 5.4 s, plus one 2 s scan.
                assertThat(m.deadTimeS()).isBetween(0.5, 7.4);
                assertThat(m.opposite()).isFalse();
            }
            assertThat(r.findings()).isEmpty();
            assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.PASS);
        }
    }

    /** Runs the quick plan on basin-steam-1 (quiet loads, 10:30) with a plant fault on its interface. */
    private static PulseTestResult withFault(PlantFaultFlags fault) throws Exception {
        try (EmulatorRig rig = new EmulatorRig("basin-steam-1", "quick.yaml", 10.5, 2_000, true)) {
            rig.unit().setFaultFlags(fault);
            return rig.settle(120).run();
        }
    }

    @Test
    void shouldFindAUnitThatAcksPulsesButIgnoresThem() throws Exception {
        PulseTestResult r = withFault(new PlantFaultFlags() {
            @Override
            public boolean ignorePulses() {
                return true;
            }
        });
        assertThat(r.record().state()).isEqualTo(RunState.FINISHED);
        // every command acked as accepted: only the output shows the fault
        assertThat(r.record().acks().values()).allSatisfy(a -> assertThat(a.reason()).isNull());
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        assertThat(r.findings()).first().isEqualTo(Finding.NO_MOVEMENT);
        for (StepMeasurement m : moves(r)) {
            assertThat(m.measuredChangeMw()).isCloseTo(0.0, within(0.05)); // quiet loads: nothing moves it
        }
    }

    @Test
    void shouldFindAUnitThatAnswersSlowly() throws Exception {
        PulseTestResult r = withFault(new PlantFaultFlags() {
            @Override
            public double slowFactor() {
                return 3.0;
            }
        });
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        // Each 12 MW move needs 120 s at a third of the pulse rate but gets a 77 s window, so the next
        // step starts while the unit is still moving: the short raise pulse after the unfinished lower
        // move nets a fall and is also reported as opposite. The staircases themselves are not.
        assertThat(r.findings()).contains(Finding.RAMP_TOO_SLOW, Finding.GAIN_LOW).doesNotContain(Finding.NO_MOVEMENT);
        for (StepMeasurement m : moves(r)) {
            assertThat(m.opposite()).isFalse();
            // the reference moves at 18 / 3 = 6 MW/min: far below the 17.35 MW/min expected
            assertThat(m.rampMwPerMin()).isBetween(3.0, 6.0);
        }
    }

    @Test
    void shouldFindRaiseAndLowerSwapped() throws Exception {
        PulseTestResult r = withFault(new PlantFaultFlags() {
            @Override
            public boolean swapRaiseLower() {
                return true;
            }
        });
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        assertThat(r.findings()).first().isEqualTo(Finding.OPPOSITE_DIRECTION);
        for (StepMeasurement m : moves(r)) {
            assertThat(m.opposite()).isTrue();
            // the same size of move the wrong way: gain about −0.29 MW/pulse-s (see the test above)
            assertThat(m.gainMwPerPulseS()).isCloseTo(-0.29, within(0.03));
        }
    }
}
