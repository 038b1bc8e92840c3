package org.loopstand.controller.pulsetest.programme;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.catchThrowableOfType;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulsetest.plan.PlanException;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.plan.TestPlanLoader;

class PulseProgrammeTest {
    private static final TestPlan STANDARD = TestPlanLoader.load(Path.of("..", "config", "plans", "standard.yaml"));
    // An invented unit like the demo site's first steam unit: range 500–870 MW, ramp 20, pulse rate 18 MW/min.
    private static final UnitDeclaration UNIT = new UnitDeclaration("u", 500, 870, 20, 18, "test");

    @Test
    void shouldSizePulsesFromTheDeclaredPulseRate() {
        PulseProgramme p = PulseProgramme.expand(STANDARD, UNIT, 700);
        ProgrammeStep first = p.steps().get(1); // staircase raise 1/3: 2 % of 370 MW = 7.4 MW
        assertThat(first.label()).isEqualTo("staircase raise 1/3");
        // 7.4 MW at 18 MW/min = 24.667 s of pulse, split into 10 s + 10 s + 4.667 s
        assertThat(first.pulses()).extracting(TimedPulse::durationMs).containsExactly(10_000L, 10_000L, 4_667L);
        assertThat(first.requestedChangeMw()).isCloseTo(7.4, within(0.001));
        assertThat(first.pulses().get(1).atOffsetMs() - first.pulses().get(0).atOffsetMs()).isEqualTo(10_500);
    }

    @Test
    void shouldWaitLongEnoughForTheDeclaredRamp() {
        PulseProgramme p = PulseProgramme.expand(STANDARD, UNIT, 700);
        for (ProgrammeStep s : p.steps()) {
            if (s.kind() == StepKind.HOLD) {
                continue;
            }
            double rampS = Math.abs(s.requestedChangeMw()) / UNIT.rampMwPerMin() * 60;
            long lastPulseEnd = s.pulses().get(s.pulses().size() - 1).endOffsetMs() - s.startOffsetMs();
            long windowMs = s.endOffsetMs() - s.startOffsetMs();
            assertThat(windowMs).as(s.label()).isGreaterThanOrEqualTo(Math.round(rampS * 1000 * 1.5) + 30_000)
                    .isGreaterThan(lastPulseEnd);
        }
    }

    @Test
    void shouldGoToTheLimitLessItsMarginAndBack() {
        PulseProgramme p = PulseProgramme.expand(STANDARD, UNIT, 700);
        ProgrammeStep out = p.steps().stream().filter(s -> s.label().equals("rampToLimit raise out")).findFirst().orElseThrow();
        ProgrammeStep back = p.steps().get(out.index() + 1);
        // limit 870 less 5 % of 370 = 851.5 MW; the staircases returned to 700 MW
        assertThat(out.expectedEndMw()).isCloseTo(851.5, within(0.01));
        assertThat(back.expectedEndMw()).isCloseTo(700, within(0.01));
        assertThat(p.maxExcursionMw()).isCloseTo(151.5, within(0.01));
    }

    @Test
    void shouldRefuseAStepThatLeavesTheRegulatingRange() {
        PlanException e = catchThrowableOfType(PlanException.class, () -> PulseProgramme.expand(STANDARD, UNIT, 865));
        // the step is named where it is written, in the one form of every config problem
        assertThat(e.problems()).anyMatch(s -> s.matches(".*standard\\.yaml:\\d+:\\d+: plan step .*outside the regulating range.*"));
    }
}
