package org.loopstand.plant.check;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.fault.FaultSpec.Problem;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.SuspendedArea;
import org.loopstand.protocol.message.UnitCommand;

/** Each check on a hand-made run record whose deciding figure can be worked out by hand. */
class CheckEvaluationTest {
    private static final long T0 = 1_767_225_600_000L;
    private final Grid grid;
    private final TargetCatalog catalog;

    CheckEvaluationTest() throws Exception {
        grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        catalog = TargetCatalog.of(grid);
    }

    private CheckSpec check(String type, Map<String, Object> params) {
        List<Problem> problems = new java.util.ArrayList<>();
        CheckSpec spec = CheckSpec.assemble(type, CheckLibrary.standard().type(type).orElseThrow(), params, catalog, problems);
        assertThat(problems).isEmpty();
        return spec;
    }

    /** 50 Hz to 10 s, 49.9 Hz to 40 s, a straight line back to 50 Hz at 60 s; net interchange on schedule. */
    private RunRecord dipAndRecovery(boolean recovers) {
        RunRecord run = new RunRecord(T0);
        for (int t = 0; t <= 100; t++) {
            double f = t < 10 ? 50 : t <= 40 ? 49.9 : recovers ? Math.min(50, 49.9 + 0.1 * (t - 40) / 20.0) : 49.9;
            run.series("frequencyHz/north-basin").add(t, f);
            run.series("netInterchangeMw/north-basin").add(t, 100);
        }
        run.end(100);
        return run;
    }

    @Test
    void shouldTimeTheFrequencyBackInsideItsBand() {
        // |Δf| = 0.1·(60 − t)/20 Hz is above 23 mHz while t < 55.4 s: last out at 55 s, back at 56 s, 46 s after 10 s
        CheckOutcome ok = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "withinS", 50.0, "bandMhz", 23.0))
                .evaluate(dipAndRecovery(true), grid);
        assertThat(ok.passed()).isTrue();
        assertThat(ok.decidingFigure()).isCloseTo(46, within(1e-9));
        CheckOutcome late = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "withinS", 40.0, "bandMhz", 23.0))
                .evaluate(dipAndRecovery(true), grid);
        assertThat(late.passed()).isFalse();
        assertThat(late.decidingFigure()).isCloseTo(46, within(1e-9));
        assertThat(late.limit()).isEqualTo(40);
        CheckOutcome never = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "bandMhz", 20.0))
                .evaluate(dipAndRecovery(false), grid);
        assertThat(never.passed()).isFalse();
        assertThat(never.decidingFigure()).isNaN();
        assertThat(never.detail()).contains("not back by the end").contains("deviation then 100.000 mHz");
    }

    /** The recovery above, then a noise-like excursion to 49.97 Hz for 3 s at 90–92 s. */
    private RunRecord recoveryThenLateExcursion() {
        RunRecord run = new RunRecord(T0);
        for (int t = 0; t <= 100; t++) {
            double f = t < 10 ? 50 : t <= 40 ? 49.9 : t >= 90 && t <= 92 ? 49.97 : Math.min(50, 49.9 + 0.1 * (t - 40) / 20.0);
            run.series("frequencyHz/north-basin").add(t, f);
            run.series("netInterchangeMw/north-basin").add(t, 100);
        }
        run.end(100);
        return run;
    }

    @Test
    void shouldCountAReturnThatHoldsForHoldSAsRestoredAndReportTheLaterExcursion() {
        // back in the ±23 mHz band at 56 s (see above) and in it for 30 s to 86 s: restored 46 s after 10 s;
        // the 30 mHz excursion at 90–92 s is reported, it does not undo the restoration
        CheckOutcome held = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "withinS", 50.0, "bandMhz", 23.0,
                "holdS", 30.0)).evaluate(recoveryThenLateExcursion(), grid);
        assertThat(held.passed()).isTrue();
        assertThat(held.decidingFigure()).isCloseTo(46, within(1e-9));
        assertThat(held.detail()).contains("from 56 s on for 30 s").contains("out of band again from 90 s, 3 truth samples, worst 30.000 mHz");
        // a hold longer than the quiet stretch (56–89 s) starts again after the excursion: back at 93 s, 83 s after 10 s
        CheckOutcome longHold = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "withinS", 50.0,
                "bandMhz", 23.0, "holdS", 40.0)).evaluate(recoveryThenLateExcursion(), grid);
        assertThat(longHold.passed()).isFalse();
        assertThat(longHold.decidingFigure()).isCloseTo(83, within(1e-9));
        // without holdS it must stay to the end: the excursion decides, back at 93 s
        CheckOutcome toEnd = check("frequencyRestored", Map.of("area", "north-basin", "afterS", 10.0, "withinS", 50.0, "bandMhz", 23.0))
                .evaluate(recoveryThenLateExcursion(), grid);
        assertThat(toEnd.passed()).isFalse();
        assertThat(toEnd.decidingFigure()).isCloseTo(83, within(1e-9));
    }

    @Test
    void shouldTimeTheAceRecovery() {
        // European ACE = ΔNI + K·Δf with K = 954 MW/Hz (demo site); ΔNI = 0. ACE ≥ −5 MW needs Δf ≥ −5/954 Hz,
        // i.e. 0.1·(60 − t)/20 ≤ 0.00524 → t ≥ 58.95 s: first sample 59 s, 49 s after the dip at 10 s
        CheckOutcome out = check("aceRecovered", Map.of("area", "north-basin", "afterS", 10.0, "toleranceMw", 5.0))
                .evaluate(dipAndRecovery(true), grid);
        assertThat(out.passed()).isTrue();
        assertThat(out.decidingFigure()).isCloseTo(49, within(1e-9));
        assertThat(TruthAce.of(dipAndRecovery(true), grid, "north-basin").value(20)).isCloseTo(-95.4, within(1e-9));
        CheckOutcome never = check("aceRecovered", Map.of("area", "north-basin", "afterS", 10.0)).evaluate(dipAndRecovery(false), grid);
        assertThat(never.passed()).isFalse();
        assertThat(never.detail()).contains("ACE then -95.400 MW");
    }

    private FaultSpec freeze(double startS, double endS) {
        return FaultSpec.builder(FaultLibrary.standard(), catalog).id("fz").type("freezeValue").target("north-basin")
                .window(startS, endS).build();
    }

    private static UnitCommand pulse(long seq, String unit, double issuedS, long validForMs) {
        long at = T0 + Math.round(issuedS * 1000);
        return UnitCommand.pulse(seq, at, unit, "agc-1", 1, at + validForMs, PulseDirection.RAISE, 1000);
    }

    @Test
    void shouldCountPulsesIssuedWhileTheMeterWasStale() {
        RunRecord run = new RunRecord(T0);
        run.faultStarted(T0 + 100_000, freeze(100, 200), "scenario");
        run.faultStopped(T0 + 200_000, freeze(100, 200), "scenario", "window ended");
        run.end(300);
        // detectS 12: the stale interval to judge is [112, 200) s
        run.commandHandled(T0 + 105_000, pulse(1, "basin-steam-1", 105, 8000), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0 + 150_000, pulse(2, "basin-steam-1", 150, 8000), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0 + 160_000, pulse(3, "ridge-hydro-1", 160, 8000), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0 + 199_000, pulse(4, "basin-gas-1", 199, 8000), AckOutcome.REJECTED, RefusalReason.AT_LIMIT, false);
        run.commandHandled(T0 + 201_000, pulse(5, "basin-gas-1", 201, 8000), AckOutcome.ACCEPTED, null, true);
        // a setpoint moves the unit as blindly as a pulse: it counts too
        run.commandHandled(T0 + 170_000, UnitCommand.setpoint(6, T0 + 170_000, "basin-steam-2", "agc-1", 1, T0 + 174_000, 600.0),
                AckOutcome.ACCEPTED, null, true);
        CheckOutcome out = check("noPulseWhileStale", Map.of("area", "north-basin")).evaluate(run, grid);
        assertThat(out.passed()).isFalse();
        assertThat(out.decidingFigure()).isEqualTo(3); // seq 2, 4 and the setpoint 6; seq 3 goes to the other area
        assertThat(out.detail()).contains("3 of 5 commands").contains("[112, 200) s");
    }

    @Test
    void shouldCountCommandsIssuedWhileOnePointOfTheMeterHeldItsLastValue() {
        FaultSpec hold = FaultSpec.builder(FaultLibrary.standard(), catalog).id("hl").type("holdLast")
                .target("north-basin").window(100, 200).build();
        RunRecord run = new RunRecord(T0);
        run.faultStarted(T0 + 100_000, hold, "scenario");
        run.faultStopped(T0 + 200_000, hold, "scenario", "window ended");
        run.end(300);
        run.commandHandled(T0 + 110_000, pulse(1, "basin-steam-1", 110, 8000), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0 + 150_000, pulse(2, "basin-steam-1", 150, 8000), AckOutcome.ACCEPTED, null, true);
        // detectS 30 (a frozen value takes longer to notice than a silent meter): judged [130, 200) s
        CheckOutcome out = check("noPulseWhileStale", Map.of("area", "north-basin", "detectS", 30.0))
                .evaluate(run, grid);
        assertThat(out.passed()).isFalse();
        assertThat(out.decidingFigure()).isEqualTo(1);
        assertThat(out.detail()).contains("1 of 2 commands").contains("[130, 200) s");
    }

    @Test
    void shouldFindEveryExpiredCommandThatWasNotRefusedAsExpired() {
        RunRecord run = new RunRecord(T0);
        run.commandHandled(T0 + 20_000, pulse(1, "basin-steam-2", 10, 8000), AckOutcome.REJECTED, RefusalReason.EXPIRED, false);
        run.commandHandled(T0 + 30_000, pulse(2, "basin-steam-2", 29, 8000), AckOutcome.ACCEPTED, null, true); // in time
        CheckOutcome good = check("expiredCommandsRefused", Map.of("unit", "basin-steam-2")).evaluate(run, grid);
        assertThat(good.passed()).isTrue();
        assertThat(good.decidingFigure()).isZero();
        run.commandHandled(T0 + 50_000, pulse(3, "basin-steam-2", 40, 8000), AckOutcome.ACCEPTED, null, true);
        CheckOutcome bad = check("expiredCommandsRefused", Map.of("unit", "basin-steam-2")).evaluate(run, grid);
        assertThat(bad.passed()).isFalse();
        assertThat(bad.decidingFigure()).isEqualTo(1);
        assertThat(bad.detail()).contains("1 of 2 expired commands");
        CheckOutcome none = check("expiredCommandsRefused", Map.of("unit", "basin-steam-1")).evaluate(run, grid);
        assertThat(none.passed()).isFalse();
        assertThat(none.detail()).contains("only 0 expired commands reached basin-steam-1");
    }

    @Test
    void shouldCountAnExpiredCommandRefusedAsOutOfOrderAsRefusedButNotOneRefusedForNotBeingInRemote() {
        RunRecord run = new RunRecord(T0);
        // a delayed command (seq 2) overtaken by seq 3: the unit's seq rule, applied before the expiry, refuses it
        run.commandHandled(T0 + 20_000, pulse(3, "basin-steam-1", 19, 8000), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0 + 25_000, pulse(2, "basin-steam-1", 10, 8000), AckOutcome.REJECTED, RefusalReason.OUT_OF_ORDER, false);
        CheckOutcome out = check("expiredCommandsRefused", Map.of("unit", "basin-steam-1")).evaluate(run, grid);
        assertThat(out.passed()).isTrue();
        assertThat(out.detail()).contains("0 of 1 expired commands").contains("before the expiry: 1 outOfOrder");
        // notInRemote is decided after the expiry: an expired command refused for it slipped past the expiry rule
        run.commandHandled(T0 + 40_000, pulse(4, "basin-steam-1", 30, 8000), AckOutcome.REJECTED, RefusalReason.NOT_IN_REMOTE, false);
        CheckOutcome bad = check("expiredCommandsRefused", Map.of("unit", "basin-steam-1")).evaluate(run, grid);
        assertThat(bad.passed()).isFalse();
        assertThat(bad.detail()).contains("1 of 2 expired commands");
    }

    @Test
    void shouldTimeTheControllersSuspensionAsAControllerSideCheck() {
        RunRecord run = new RunRecord(T0);
        run.controllerStatus(T0 + 96_000, status(ControllerState.REGULATING));
        run.controllerStatus(T0 + 104_000, status(ControllerState.REGULATING));
        run.controllerStatus(T0 + 108_000, status(ControllerState.SUSPENDED));
        CheckOutcome out = check("suspendedWithin", Map.of("afterS", 100.0, "withinS", 8.0)).evaluate(run, grid);
        assertThat(out.passed()).isTrue();
        assertThat(out.decidingFigure()).isEqualTo(8);
        assertThat(out.controllerSide()).isTrue();
        assertThat(check("suspendedWithin", Map.of("afterS", 100.0, "withinS", 7.0)).evaluate(run, grid).passed()).isFalse();
    }

    @Test
    void shouldCountTheSuspensionOfTheNamedAreaWhileTheControllerRegulatesTheOthers() {
        RunRecord run = new RunRecord(T0);
        run.controllerStatus(T0 + 104_000, status(ControllerState.REGULATING));
        run.controllerStatus(T0 + 110_000, new ControllerStatus(2, T0, "agc-1", 1, ControllerState.REGULATING, List.of(), 2,
                List.of(), null, List.of(new SuspendedArea("north-basin", List.of("frequencyUnusable:north-basin"),
                        "frequency:north-basin frozen ageMs=1200", T0 + 110_000))));
        CheckOutcome north = check("suspendedWithin", Map.of("afterS", 100.0, "withinS", 12.0, "area", "north-basin"))
                .evaluate(run, grid);
        assertThat(north.passed()).isTrue();
        assertThat(north.decidingFigure()).isEqualTo(10);
        assertThat(north.detail()).contains("area [north-basin]", "frequencyUnusable:north-basin");
        // the other area was never suspended: no verdict in its favour
        assertThat(check("suspendedWithin", Map.of("afterS", 100.0, "withinS", 12.0, "area", "south-ridge"))
                .evaluate(run, grid).passed()).isFalse();
    }

    private static ControllerStatus status(ControllerState state) {
        return new ControllerStatus(1, T0, "agc-1", 1, state, state == ControllerState.SUSPENDED ? List.of("frequency frozen") : List.of(),
                1, List.of());
    }
}
