package org.loopstand.plant.check;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.withinPercentage;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.fault.FaultSpec.Problem;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.protocol.site.AceConvention;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.loopstand.plant.physics.GridSimulator;

/**
 * The restoration checks on a real physics run with primary control only, where the outcome is known
 * from outside: the two-area worked example (Saadat, Power System Analysis, ch. 12 worked example, from memory):
 * two 60 Hz areas on 1000 MVA, R1 = 0.05, D1 = 0.6, R2 = 0.0625, D2 = 0.9, load step 187.5 MW in area 1
 * → Δf = −0.1875/(20.6 + 16.9) pu = −0.005 pu = −0.3 Hz, tie flow 1→2 = −84.5 MW (re-derived:
 * ΔP12 = Δf·β2 = −0.005·16.9 pu). Without secondary control nothing returns to schedule, so the checks must
 * fail with figures that bracket those values; with bias B = −β1 the truth ACE of area 1 equals −187.5 MW
 * (ΔNI − 10B·Δf = −84.5 − 103.0; same source).
 */
class PrimaryControlChecksTest {
    private static Grid twoArea() {
        GridBuilder b = new GridBuilder("two-area-textbook");
        b.area("area1").nominalFrequencyHz(60).ratingMva(1000).inertiaS(5).dampingMwPerHz(0.6 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-20.6 * 1000 / 60 / 10);
        b.area("area2").nominalFrequencyHz(60).ratingMva(1000).inertiaS(4).dampingMwPerHz(0.9 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-16.9 * 1000 / 60 / 10);
        b.tie("tie12", "area1", "area2").synchronizingMwPerRad(2.0 * 1000 / (2 * Math.PI * 60));
        b.unit("gen1", "area1").nonReheat(0.5).governorTimeConstantS(0.2).ratingMw(1000).droopPct(5).initialOutputMw(500);
        b.unit("gen2", "area2").nonReheat(0.6).governorTimeConstantS(0.3).ratingMw(1000).droopPct(6.25).initialOutputMw(500);
        b.load("load1", "area1").baseMw(500);
        b.load("load2", "area2").baseMw(500);
        return b.build();
    }

    private final Grid grid = twoArea();
    private final RunRecord run = new RunRecord(0);

    PrimaryControlChecksTest() {
        GridSimulator sim = new GridSimulator(grid);
        for (int t = 0; t <= 300; t++) {
            sim.advanceTo(t);
            if (t == 10) {
                sim.stepLoadMw("area1", 187.5);
            }
            run.sampleTruth(t, sim);
        }
        run.end(300);
    }

    private CheckOutcome check(String type, Map<String, Object> params) {
        List<Problem> problems = new ArrayList<>();
        CheckSpec spec = CheckSpec.assemble(type, CheckLibrary.standard().type(type).orElseThrow(), params, TargetCatalog.of(grid), problems);
        assertThat(problems).isEmpty();
        return spec.evaluate(run, grid);
    }

    @Test
    void shouldFindTheFrequencyOffsetOfPrimaryControl() {
        assertThat(check("frequencyRestored", Map.of("area", "area1", "afterS", 10.0, "withinS", 280.0, "bandMhz", 290.0)).passed())
                .isFalse();
        CheckOutcome wide = check("frequencyRestored", Map.of("area", "area1", "afterS", 10.0, "withinS", 280.0, "bandMhz", 310.0));
        assertThat(wide.passed()).isTrue();
        assertThat(wide.decidingFigure()).isBetween(0.0, 280.0);
    }

    @Test
    void shouldFindTheTieFlowOffsetOfPrimaryControl() {
        assertThat(check("tieFlowRestored", Map.of("tie", "tie12", "afterS", 10.0, "withinS", 280.0, "bandMw", 80.0)).passed()).isFalse();
        assertThat(check("tieFlowRestored", Map.of("tie", "tie12", "afterS", 10.0, "withinS", 280.0, "bandMw", 90.0)).passed()).isTrue();
    }

    @Test
    void shouldSeeTheTruthAceEqualTheLoadStepAndNeverRecover() {
        RunRecord.Series ace = TruthAce.of(run, grid, "area1");
        assertThat(ace.value(ace.size() - 1)).isCloseTo(-187.5, withinPercentage(1));
        CheckOutcome out = check("aceRecovered", Map.of("area", "area1", "afterS", 10.0, "withinS", 280.0));
        assertThat(out.passed()).isFalse();
        assertThat(out.decidingFigure()).isNaN();
        assertThat(out.detail()).contains("not recovered by the end");
    }
}
