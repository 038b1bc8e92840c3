package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.grid.AceConvention;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.site.SiteLoader;

/**
 * The controller process (agent, intake, wire records) closing the loop around the project's plant
 * physics in study mode. Two-area system of CHECKS.md item 2 (Saadat, Power System Analysis, ch. 12
 * worked example, from memory): 1000 MVA base, 60 Hz; area 1 R = 0.05, D = 0.6, H = 5; area 2
 * R = 0.0625, D = 0.9, H = 4; synchronizing coefficient 2.0 pu (5.31 MW/rad in our tie law, see
 * the physics tests); load step 187.5 MW in area 1. β1 = 1/R1 + D1 = 20.6 pu = 343.3 MW/Hz
 * (B1 = −34.33 MW/0.1 Hz), β2 = 16.9 pu = 281.7 MW/Hz (B2 = −28.17 MW/0.1 Hz).
 */
class ClosedLoopStudyTest {
    private static final double STEP_MW = 187.5;
    private static final double STEP_AT_S = 60;

    static Grid twoAreaGrid() {
        GridBuilder b = new GridBuilder("two-area-textbook");
        b.area("area1").nominalFrequencyHz(60).ratingMva(1000).inertiaS(5).dampingMwPerHz(0.6 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-34.333);
        b.area("area2").nominalFrequencyHz(60).ratingMva(1000).inertiaS(4).dampingMwPerHz(0.9 * 1000 / 60)
                .aceConvention(AceConvention.NORTH_AMERICAN).biasMwPer01Hz(-28.167);
        b.tie("tie12", "area1", "area2").synchronizingMwPerRad(2.0 * 1000 / (2 * Math.PI * 60));
        b.unit("gen1", "area1").nonReheat(0.5).governorTimeConstantS(0.2).ratingMw(1000).droopPct(5)
                .initialOutputMw(500).rampMwPerMin(600).pulseRateMwPerMin(600).acceptsSetpoints(false);
        b.unit("gen2", "area2").nonReheat(0.6).governorTimeConstantS(0.3).ratingMw(1000).droopPct(6.25)
                .initialOutputMw(500).rampMwPerMin(600).pulseRateMwPerMin(600).acceptsSetpoints(false);
        b.load("load1", "area1").baseMw(500);
        b.load("load2", "area2").baseMw(500);
        return b.build();
    }

    static ControllerSiteConfig twoAreaController(String aceMode) {
        return ControllerSiteReader.read("two-area.yaml", """
                siteId: two-area-textbook
                areas:
                  - {id: area1, nominalFrequencyHz: 60, aceConvention: northAmerican, biasMwPer01Hz: -34.333}
                  - {id: area2, nominalFrequencyHz: 60, aceConvention: northAmerican, biasMwPer01Hz: -28.167}
                ties:
                  - {id: tie12, fromArea: area1, toArea: area2}
                units:
                  - {id: gen1, area: area1, ratingMw: 1000, droopPct: 5}
                  - {id: gen2, area: area2, ratingMw: 1000, droopPct: 6.25}
                controller:
                  cycleS: 4
                  aceMode: %s
                  regulation: {filterTimeConstantS: 4, kp: 0.2, integralTimeS: 40, quietMw: 1, assistMw: 1000}
                  pulses: {minPulseMs: 100, maxPulseMs: 4000, preferSetpoints: false}
                  following: {toleranceMw: 20}
                """.formatted(aceMode));
    }

    @Test
    void shouldRestoreFrequencyAndTieWithDisturbedAreaAlonePickingUpTheStepUnderTieLineBias() {
        StudyLoop loop = new StudyLoop(new GridSimulator(twoAreaGrid()), twoAreaController("tieLineBias"));
        loop.runTo(STEP_AT_S);
        assertThat(loop.agent.lastOutcome().state().name()).isEqualTo("REGULATING");
        loop.sim.stepLoadMw("area1", STEP_MW);
        loop.runTo(STEP_AT_S + 20);
        // primary response alone settles at −0.3 Hz (CHECKS.md 2); the first swing reaches about that
        assertThat(loop.sim.frequencyHz("area1")).isLessThan(60 - 0.1);
        // "frequency returns within a few minutes" (common practice, no source): 5 minutes after the step
        loop.runTo(STEP_AT_S + 300);
        assertThat(loop.sim.frequencyHz("area1")).isCloseTo(60, within(0.005));
        assertThat(loop.sim.tieFlowMw("tie12")).isCloseTo(0, within(5.0));
        loop.runTo(STEP_AT_S + 600);
        assertThat(loop.sim.frequencyHz("area1")).isCloseTo(60, within(0.001));
        assertThat(loop.sim.frequencyHz("area2")).isCloseTo(60, within(0.001));
        assertThat(loop.sim.tieFlowMw("tie12")).isCloseTo(0, within(1.0));
        // CHECKS.md 3: area 1 alone picks up the 187.5 MW (within 1 %)
        assertThat(loop.sim.outputMw("gen1") - 500).isCloseTo(STEP_MW, within(0.01 * STEP_MW));
        assertThat(loop.sim.outputMw("gen2") - 500).isCloseTo(0, within(0.01 * STEP_MW));
        assertThat(loop.plant.accepted).isNotEmpty().allSatisfy(c -> assertThat(c.kind().name()).isEqualTo("PULSE"));
        assertThat(loop.plant.refused).isZero();
        assertThat(loop.agent.intake().acksByOutcome()).containsKey("accepted").doesNotContainKey("refused:EXPIRED");
    }

    @Test
    void shouldShareTheStepBetweenBothAreasUnderFlatFrequencyControl() {
        StudyLoop loop = new StudyLoop(new GridSimulator(twoAreaGrid()), twoAreaController("flatFrequency"));
        loop.runTo(STEP_AT_S);
        loop.sim.stepLoadMw("area1", STEP_MW);
        loop.runTo(STEP_AT_S + 900);
        assertThat(loop.sim.frequencyHz("area1")).isCloseTo(60, within(0.002));
        double picked1 = loop.sim.outputMw("gen1") - 500;
        double picked2 = loop.sim.outputMw("gen2") - 500;
        assertThat(picked1 + picked2).isCloseTo(STEP_MW, within(2.0));
        // both areas answer the frequency, so area 2 takes a real share and the tie carries it
        assertThat(picked2).isGreaterThan(0.2 * STEP_MW);
        assertThat(picked1).isGreaterThan(0.2 * STEP_MW);
        assertThat(-loop.sim.tieFlowMw("tie12")).isCloseTo(picked2, within(3.0));
    }

    @Test
    void shouldRestoreFrequencyAfterAUnitTripInTheDemoSiteByPulsesAndSetpoints() throws Exception {
        Path site = Path.of("..", "config", "sites", "demo-site.yaml");
        Grid grid = SiteLoader.load(site);
        GridSimulator sim = new GridSimulator(grid, 0.01, 42, 10.5);
        StudyLoop loop = new StudyLoop(sim, ControllerSiteReader.read(site));
        loop.runTo(60);
        sim.trip("ridge-hydro-2");
        loop.runTo(90);
        assertThat(sim.frequencyHz("south-ridge")).isLessThan(50 - 0.05);
        loop.runTo(60 + 900);
        // CHECKS.md 9 (SOGL, from memory): standard frequency range ±50 mHz, restored within 15 minutes
        assertThat(sim.frequencyHz("south-ridge")).isCloseTo(50, within(0.05));
        assertThat(sim.tieFlowMw("basin-ridge")).isCloseTo(100, within(40.0));
        assertThat(loop.plant.accepted).isNotEmpty();
    }
}
