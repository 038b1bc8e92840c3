package org.loopstand.controller.pulsetest;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.io.ByteArrayInputStream;
import java.io.InputStream;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulsetest.analysis.Finding;
import org.loopstand.controller.pulsetest.analysis.StepMeasurement;
import org.loopstand.controller.pulsetest.plan.PlanLimits;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.controller.pulsetest.safety.KeyAbortSwitch;

class PulseTestRunnerTest {

    private static List<StepMeasurement> moves(PulseTestResult r) {
        return r.steps().stream().filter(s -> s.evidence().window().kind() == StepKind.STAIRCASE)
                .map(s -> s.evidence().measurement()).toList();
    }

    @Test
    void shouldMeasureTheConfiguredRampGainAndDeadTime() {
        // Pulse rate above the ramp: the output is ramp-limited, so the measured ramp is the unit's ramp.
        Rig rig = new Rig("quick.yaml", 12, 30, 4000);
        PulseTestResult r = rig.run();

        assertThat(r.record().state()).isEqualTo(RunState.FINISHED);
        assertThat(moves(r)).hasSize(2);
        for (StepMeasurement m : moves(r)) {
            assertThat(m.rampMwPerMin()).isCloseTo(12.0, within(0.36));       // ±3 %
            assertThat(m.gainMwPerPulseS()).isCloseTo(30.0 / 60, within(0.015)); // ±3 % of 0.5
            assertThat(m.deadTimeS()).isCloseTo(4.0, within(0.5));
            assertThat(Math.abs(m.measuredChangeMw())).isCloseTo(12.0, within(0.1));
        }
        assertThat(r.findings()).isEmpty();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.PASS);
    }

    @Test
    void shouldPassAReferenceLimitedUnitAgainstTheAchievableRamp() {
        // Pulse rate below the ramp: the reference moves at 18 MW/min less the gaps between split pulses.
        Rig rig = new Rig("quick.yaml", 20, 18, 2000);
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.PASS);
        assertThat(moves(r).get(0).rampMwPerMin()).isCloseTo(18.0 * 10 / 10.5, within(0.5));
    }

    @Test
    void shouldFindAUnitThatIgnoresPulses() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.unit.fault = ModelUnit.Fault.IGNORES_PULSES;
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        assertThat(r.findings()).first().isEqualTo(Finding.NO_MOVEMENT);
        assertThat(moves(r).get(0).measuredChangeMw()).isCloseTo(0.0, within(0.01));
    }

    @Test
    void shouldFindASlowUnit() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.unit.fault = ModelUnit.Fault.SLOW;
        rig.unit.slowFactor = 0.5;
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        assertThat(r.findings()).contains(Finding.RAMP_TOO_SLOW).doesNotContain(Finding.OPPOSITE_DIRECTION);
        assertThat(moves(r).get(0).rampMwPerMin()).isCloseTo(6.0, within(0.3));
    }

    @Test
    void shouldFindSwappedRaiseAndLower() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.unit.fault = ModelUnit.Fault.SWAPPED;
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.FAIL);
        assertThat(r.findings()).first().isEqualTo(Finding.OPPOSITE_DIRECTION);
        assertThat(moves(r).get(0).gainMwPerPulseS()).isCloseTo(-0.5, within(0.02));
    }

    @Test
    void shouldReportRefusedCommandsWithTheirReason() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.unit.refuseAll = true;
        PulseTestResult r = rig.run();
        assertThat(r.findings()).contains(Finding.REFUSED);
        assertThat(r.rows()).filteredOn(j -> j.figure().equals("commands") && !j.passed())
                .first().satisfies(j -> assertThat(j.decidingFigure()).contains("atLimit ×"));
    }

    @Test
    void shouldRefuseAProgrammeBeyondTheExcursionCapAndSendNothing() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.runner(new PlanLimits(5, 900), org.loopstand.controller.pulsetest.safety.AbortSwitch.NEVER);
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.REFUSED);
        assertThat(r.record().stopReason()).contains("12.00 MW").contains("cap of 5.00 MW");
        assertThat(rig.unit.commandsReceived).isZero();
    }

    @Test
    void shouldRefuseAProgrammeBeyondTheDurationCapAndSendNothing() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.runner(new PlanLimits(20, 60), org.loopstand.controller.pulsetest.safety.AbortSwitch.NEVER);
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.REFUSED);
        assertThat(r.record().stopReason()).contains("cap of 60 s");
        assertThat(rig.unit.commandsReceived).isZero();
    }

    @Test
    void shouldStopOnTheAbortKeyAndSendNothingFurther() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        InputStream keys = new ByteArrayInputStream("q\n".getBytes());
        boolean[] armed = {false};
        rig.runner(rig.plan.limits(), () -> armed[0] && new KeyAbortSwitch(keys).abortRequested());
        int[] sentAtAbort = {-1};
        PulseTestResult r = rig.run(() -> {
            if (!armed[0] && rig.unit.commandsReceived >= 2) {
                armed[0] = true;
            }
            if (rig.runner.isDone() && sentAtAbort[0] < 0) {
                sentAtAbort[0] = rig.unit.commandsReceived;
            }
        });
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.ABORTED);
        assertThat(r.record().stopReason()).contains("abort key");
        // Nothing after the abort: the unit saw exactly the commands sent before it.
        assertThat(rig.unit.commandsReceived).isEqualTo(sentAtAbort[0]).isEqualTo(r.record().pulses().size());
        long abortMs = r.record().stoppedMs();
        assertThat(r.record().pulses()).allMatch(p -> p.sentMs() <= abortMs);
    }

    @Test
    void shouldStopWhenTelemetryIsLostAndSendNothingFurther() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        long[] lostAt = {-1};
        PulseTestResult r = rig.run(() -> {
            if (lostAt[0] < 0 && rig.unit.commandsReceived >= 1) {
                rig.unit.telemetryOn = false;
                lostAt[0] = rig.clock.epochMillis();
            }
        });
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.ABORTED);
        assertThat(r.record().stopReason()).contains("telemetry lost");
        // 5 scans of 1 s: stopped between 5 and 6 s after the last reading.
        long lastReadingMs = r.record().telemetry().stream().filter(TelemetryPoint::good)
                .mapToLong(TelemetryPoint::tMs).filter(t -> t <= lostAt[0]).max().orElseThrow();
        assertThat(r.record().stoppedMs() - lastReadingMs).isBetween(5000L, 6100L);
        long stop = r.record().stoppedMs();
        assertThat(r.record().pulses()).allMatch(p -> p.sentMs() <= stop);
        int before = rig.unit.commandsReceived;
        assertThat(before).isEqualTo(r.record().pulses().size());
    }

    @Test
    void shouldRefuseAUnitInLocalModeAndSendNothing() {
        Rig rig = new Rig("quick.yaml", 12, 30, 2000);
        rig.unit.mode = org.loopstand.protocol.message.ControlMode.LOCAL;
        PulseTestResult r = rig.run();
        assertThat(r.verdict()).isEqualTo(PulseTestResult.Verdict.REFUSED);
        assertThat(r.record().stopReason()).contains("local");
        assertThat(rig.unit.commandsReceived).isZero();
    }
}
