package org.loopstand.plant.check;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.SuspendedArea;
import org.loopstand.protocol.message.UnitCommand;

/**
 * noBumpAfterResume on hand-made runs of the demo site. North-basin at the resume (100 s): 49.98 Hz and
 * its scheduled 100 MW export, so the truth ACE is 954 MW/Hz × (−0.02 Hz) = −19.08 MW and calls for
 * +19.08 MW. basin-gas-1 moves 30 MW/min of pulse, basin-steam-1 18 MW/min (site file).
 */
class ResumeChecksTest {
    private static final long T0 = 1_767_225_600_000L;
    private static final String AREA = "north-basin";
    private static final Grid GRID;
    private static long seq;

    static {
        try {
            GRID = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
    }

    private static CheckOutcome decide(RunRecord run) {
        List<FaultSpec.Problem> problems = new ArrayList<>();
        CheckSpec spec = CheckSpec.assemble("no-bump", CheckLibrary.standard().type("noBumpAfterResume").orElseThrow(),
                Map.of("area", AREA), TargetCatalog.of(GRID), problems);
        assertThat(problems).isEmpty();
        return spec.evaluate(run, GRID);
    }

    /** Truth every second 0–200 s, statuses every 4 s: suspended in [40, 100), regulating otherwise. */
    private static RunRecord suspendedFrom40To100() {
        RunRecord run = truth();
        for (int s = 0; s <= 200; s += 4) {
            run.controllerStatus(ms(s), status(s, s >= 40 && s < 100 ? ControllerState.SUSPENDED : ControllerState.REGULATING));
        }
        return run;
    }

    private static RunRecord truth() {
        RunRecord run = new RunRecord(T0);
        for (int s = 0; s <= 200; s++) {
            run.series("frequencyHz/" + AREA).add(s, 49.98);
            run.series("netInterchangeMw/" + AREA).add(s, 100);
            run.series("outputMw/basin-steam-1").add(s, 200);
            run.series("loadReferenceMw/basin-steam-1").add(s, 200);
        }
        return run;
    }

    /**
     * As {@link #suspendedFrom40To100()}, but a load step at 90 s: basin-steam-1's governor has raised its
     * output 30 MW above its load reference of 200 MW by the resume (primary response on top of the load
     * reference, which only the controller's commands move).
     */
    private static RunRecord governorRaisedOutputAtResume() {
        RunRecord run = new RunRecord(T0);
        for (int s = 0; s <= 200; s++) {
            run.series("frequencyHz/" + AREA).add(s, 49.98);
            run.series("netInterchangeMw/" + AREA).add(s, 100);
            run.series("outputMw/basin-steam-1").add(s, s < 90 ? 200 : 230);
            run.series("loadReferenceMw/basin-steam-1").add(s, 200);
        }
        for (int s = 0; s <= 200; s += 4) {
            run.controllerStatus(ms(s), status(s, s >= 40 && s < 100 ? ControllerState.SUSPENDED : ControllerState.REGULATING));
        }
        return run;
    }

    private static long ms(double s) {
        return T0 + Math.round(s * 1000);
    }

    private static ControllerStatus status(double s, ControllerState state) {
        List<SuspendedArea> suspended = state == ControllerState.SUSPENDED
                ? List.of(new SuspendedArea(AREA, List.of("frequencyUnusable:" + AREA), "", ms(40))) : null;
        return new ControllerStatus(++seq, ms(s), "controller-1", 1, state, List.of(), (long) s / 4,
                List.of(new AreaAce(AREA, -19, -19, "normal")), List.of(), suspended, null, null);
    }

    private static UnitCommand pulse(RunRecord run, double issuedS, String unit, PulseDirection d, long durationMs) {
        UnitCommand c = UnitCommand.pulse(++seq, ms(issuedS), unit, "controller-1", 1, ms(issuedS + 4), d, durationMs);
        run.commandHandled(ms(issuedS + 0.1), c, AckOutcome.ACCEPTED, null, true);
        return c;
    }

    @Test
    void shouldPassFirstCommandsThatAskNoMoreThanTheAceCallsFor() {
        RunRecord run = suspendedFrom40To100();
        pulse(run, 101, "basin-gas-1", PulseDirection.RAISE, 20_000); // +10 MW
        UnitCommand twice = pulse(run, 105, "basin-steam-1", PulseDirection.RAISE, 20_000); // +6 MW
        run.commandHandled(ms(105.2), twice, AckOutcome.REJECTED, null, false); // the same command again: asks once
        pulse(run, 109, "basin-gas-1", PulseDirection.RAISE, 60_000); // after the 8 s window

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isTrue();
        assertThat(o.decidingFigure()).isZero();
        assertThat(o.detail()).contains("1 resume(s): controller-1 north-basin at 100.0 s after suspended"
                + " [frequencyUnusable:north-basin]: 2 commands asked +16.0 MW in 8 s, ACE -19.1 MW calls for +19.1 MW");
    }

    @Test
    void shouldFailASetpointThatJumpsPastWhatTheAceCallsFor() {
        RunRecord run = suspendedFrom40To100();
        UnitCommand jump = UnitCommand.setpoint(++seq, ms(102), "basin-steam-1", "controller-1", 1, ms(106), 260);
        run.commandHandled(ms(102.1), jump, AckOutcome.ACCEPTED, null, true);

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isFalse();
        assertThat(o.decidingFigure()).isCloseTo(60 - 19.08, org.assertj.core.data.Offset.offset(1e-6));
    }

    @Test
    void shouldJudgeASetpointByTheLoadReferenceItMovesNotByTheGovernorsShareOfTheOutput() {
        // A unit's output is its load reference plus the governor's droop response to the frequency; secondary
        // control moves only the load reference (from memory: Kundur, Power System Stability and Control, 1994,
        // ch. 11, speed governor with load reference set point). A setpoint 5 MW above the load reference asks
        // +5 MW, although it lies 25 MW below the output the governor holds after the load step.
        RunRecord run = governorRaisedOutputAtResume();
        UnitCommand raise = UnitCommand.setpoint(++seq, ms(101), "basin-steam-1", "controller-1", 1, ms(105), 205);
        run.commandHandled(ms(101.1), raise, AckOutcome.ACCEPTED, null, true);

        CheckOutcome o = decide(run);

        assertThat(o.detail()).contains("1 commands asked +5.0 MW in 8 s, ACE -19.1 MW calls for +19.1 MW (excess 0.0 MW)");
        assertThat(o.passed()).isTrue();
    }

    @Test
    void shouldTakeTheLoadReferenceFromBeforeTheSetpointArrivedWhenTheControllersClockRunsAhead() {
        // the controller's clock ahead of the plant's: its setpoint issued at the resume (100 s on its clock)
        // reached the unit at 98.6 s of plant time and moved the load reference to 215 MW from the 99 s sample
        RunRecord run = governorRaisedOutputAtResume();
        RunRecord.Series ref = run.series("loadReferenceMw/basin-steam-1");
        for (int i = 0; i < ref.size(); i++) {
            if (ref.timeS(i) >= 99) {
                ref.values.set(i, 215.0);
            }
        }
        UnitCommand raise = UnitCommand.setpoint(++seq, ms(100), "basin-steam-1", "controller-1", 1, ms(104), 215);
        run.commandHandled(ms(98.6), raise, AckOutcome.ACCEPTED, null, true);

        CheckOutcome o = decide(run);

        assertThat(o.detail()).contains("1 commands asked +15.0 MW in 8 s");
        assertThat(o.passed()).isTrue();
    }

    @Test
    void shouldStillFailASetpointBelowTheLoadReferenceWhenTheAceCallsForRaising() {
        RunRecord run = governorRaisedOutputAtResume();
        UnitCommand lower = UnitCommand.setpoint(++seq, ms(101), "basin-steam-1", "controller-1", 1, ms(105), 180);
        run.commandHandled(ms(101.1), lower, AckOutcome.ACCEPTED, null, true);

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isFalse();
        assertThat(o.decidingFigure()).isCloseTo(20, org.assertj.core.data.Offset.offset(1e-6));
    }

    @Test
    void shouldCountTheResumingCyclesCommandsIssuedBeforeTheStatusSayingSo() {
        // in real time the cycle that resumes sends its commands, then publishes its status: at rate 40 the
        // status's sourceTime came 0.4 s of scenario time after them (seen in a rehearsal of cluster-unit-trip.yaml)
        RunRecord run = suspendedFrom40To100();
        pulse(run, 99.6, "basin-gas-1", PulseDirection.LOWER, 40_000); // −20 MW where +19 are called for
        pulse(run, 95.9, "basin-gas-1", PulseDirection.LOWER, 40_000); // before the last suspended status: not this resume's

        CheckOutcome o = decide(run);

        assertThat(o.detail()).contains("at 100.0 s after suspended [frequencyUnusable:north-basin]: 1 commands asked -20.0 MW");
        assertThat(o.passed()).isFalse();
        assertThat(o.decidingFigure()).isCloseTo(20, org.assertj.core.data.Offset.offset(1e-6));
    }

    @Test
    void shouldFailFirstCommandsAgainstTheAceAfterASilenceOfTheStatus() {
        RunRecord run = truth();
        for (int s = 0; s <= 200; s += 4) {
            if (s < 40 || s >= 80) { // nothing heard from the controller in (40, 80): a partition, a lost node
                run.controllerStatus(ms(s), status(s, ControllerState.REGULATING));
            }
        }
        pulse(run, 81, "basin-gas-1", PulseDirection.LOWER, 40_000); // −20 MW where +19 are called for

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isFalse();
        assertThat(o.decidingFigure()).isCloseTo(20, org.assertj.core.data.Offset.offset(1e-6));
        assertThat(o.detail()).contains("at 80.0 s after 44 s without status");
    }

    @Test
    void shouldNotTakeAHeldScenarioClockForASuspension() {
        RunRecord run = truth();
        for (int s = 0; s <= 200; s += 4) {
            run.controllerStatus(ms(s), s == 60 || s == 64 // the plant's pace keeper held its clock: time stood still
                    ? new ControllerStatus(++seq, ms(s), "controller-1", 1, ControllerState.SUSPENDED,
                            List.of("waitingForClock"), 0, List.of(), null, null, null, null)
                    : status(s, s == 36 ? ControllerState.SUSPENDED : ControllerState.REGULATING));
        }
        pulse(run, 69, "basin-gas-1", PulseDirection.LOWER, 40_000); // −20 MW, judged only after a real suspension

        CheckOutcome o = decide(run);

        assertThat(o.detail()).startsWith("1 resume(s): controller-1 north-basin at 40.0 s after suspended")
                .doesNotContain("waitingForClock");
        assertThat(o.passed()).isTrue();
    }

    @Test
    void shouldTakeALastWillWithoutAreasAsHoldingEveryAreaSeenBefore() {
        RunRecord run = truth();
        run.controllerStatus(ms(36), status(36, ControllerState.REGULATING));
        run.controllerStatus(ms(40), new ControllerStatus(++seq, ms(40), "controller-1", 1, ControllerState.OFFLINE,
                List.of(), 0, List.of(), null, null, null, null)); // the last will names no area
        run.controllerStatus(ms(44), status(44, ControllerState.REGULATING));

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isTrue();
        assertThat(o.detail()).startsWith("1 resume(s): controller-1 north-basin at 44.0 s after offline []: 0 commands");
    }

    @Test
    void shouldFailWithNothingToJudgeWhenTheControllerNeverResumed() {
        RunRecord run = truth();
        for (int s = 0; s <= 200; s += 4) {
            run.controllerStatus(ms(s), status(s, ControllerState.REGULATING));
        }

        CheckOutcome o = decide(run);

        assertThat(o.passed()).isFalse();
        assertThat(o.detail()).contains("nothing to judge");
    }
}
