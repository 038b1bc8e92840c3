package org.loopstand.controller.pulsetest.plan;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.catchThrowableOfType;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.message.PulseDirection;

class TestPlanLoaderTest {
    private static final Path PLANS = Path.of("..", "config", "plans");

    @Test
    void shouldLoadTheShippedStandardPlanWithEveryStepKind() {
        TestPlan p = TestPlanLoader.load(PLANS.resolve("standard.yaml"));
        assertThat(p.steps()).extracting(PlanStep::kind).containsExactly(StepKind.HOLD, StepKind.STAIRCASE,
                StepKind.STAIRCASE, StepKind.RAMP_TO_LIMIT, StepKind.SHORT_PULSES, StepKind.SHORT_PULSES,
                StepKind.REVERSAL);
        assertThat(p.steps().get(2).direction()).isEqualTo(PulseDirection.LOWER);
        assertThat(p.steps().get(2).size()).isEqualTo(new StepSize(2, true));
        assertThat(p.limits()).isEqualTo(new PlanLimits(200, 5400));
    }

    @Test
    void shouldLoadTheShippedQuickPlan() {
        assertThat(TestPlanLoader.load(PLANS.resolve("quick.yaml")).name()).isEqualTo("quick");
    }

    @Test
    void shouldRefuseUnknownKeysNamingFileAndLine() {
        String yaml = """
                name: t
                limits: {maxExcursionMw: 10, maxDurationS: 100}
                steps:
                  - kind: staircase
                    direction: raise
                    stepMw: 2
                    cuont: 3
                """;
        ConfigFileException e = catchThrowableOfType(ConfigFileException.class, () -> TestPlanLoader.parse(yaml, "t.yaml"));
        assertThat(e.problems()).singleElement().asString().startsWith("t.yaml:7:5: unknown key 'cuont' in steps[0] (did you mean 'count'?)");
    }

    @Test
    void shouldReportEveryProblemAtOnce() {
        String yaml = """
                name: t
                tolerances:
                  gainPct: -3
                steps:
                  - kind: staircase
                    direction: up
                    stepMw: 2
                    stepPct: 1
                  - kind: jump
                """;
        ConfigFileException e = catchThrowableOfType(ConfigFileException.class, () -> TestPlanLoader.parse(yaml, "t.yaml"));
        assertThat(e.problems()).containsExactly(
                "t.yaml:1:1: the plan is missing 'limits'",
                "t.yaml:3:3: gainPct of tolerances = -3 is outside (0, 1000]",
                "t.yaml:5:5: steps[0] needs exactly one of stepMw or stepPct",
                "t.yaml:6:5: direction of steps[0] must be raise or lower, got 'up'",
                "t.yaml:9:5: kind of steps[1] 'jump' is unknown (one of hold, staircase, rampToLimit, shortPulses,"
                        + " reversal)");
    }

    @Test
    void shouldReportYamlSyntaxErrorsWithTheirLine() {
        ConfigFileException e = catchThrowableOfType(ConfigFileException.class,
                () -> TestPlanLoader.parse("name: t\nsteps: [\n  - a: b\n", "bad.yaml"));
        assertThat(e.getMessage()).startsWith("bad.yaml:").contains("not valid YAML");
    }
}
