package org.loopstand.controller.pulsetest.programme;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.loopstand.controller.pulsetest.plan.PlanException;
import org.loopstand.controller.pulsetest.plan.PlanSettings;
import org.loopstand.controller.pulsetest.plan.PlanStep;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.protocol.message.PulseDirection;

/**
 * A test plan expanded for one unit into timed pulses and measurement windows.
 *
 * <p>A move of ΔP MW is asked for with pulses totalling |ΔP| / pulseRateMwPerMin minutes, split into
 * pulses of at most {@code maxPulseMs} with {@code pulseGapMs} between them. The window after a move
 * lasts long enough for the declared ramp: expected move time × {@code waitFactor} + {@code extraWaitS},
 * where the expected move time is the longer of the pulse train and |ΔP| / rampMwPerMin.
 *
 * @param unit            declared data the expansion used
 * @param startMw         output at the start, MW
 * @param steps           measured segments, in time order, back to back after the lead-in
 * @param durationMs      whole programme, lead-in included, ms
 * @param maxExcursionMw  largest distance from {@code startMw} the programme asks for, MW
 */
public record PulseProgramme(UnitDeclaration unit, double startMw, List<ProgrammeStep> steps, long durationMs,
        double maxExcursionMw) {
    public PulseProgramme {
        steps = List.copyOf(steps);
    }

    /** @return total number of pulses */
    public int pulseCount() {
        return steps.stream().mapToInt(s -> s.pulses().size()).sum();
    }

    /**
     * Expands a plan.
     *
     * @param plan    the plan
     * @param unit    the unit's declared data
     * @param startMw output when the test starts, MW (must lie in the regulating range)
     * @throws PlanException when a step would leave the regulating range (naming the step as file:line:column)
     */
    public static PulseProgramme expand(TestPlan plan, UnitDeclaration unit, double startMw) {
        return new Expander(plan, unit, startMw).run();
    }

    private static final class Expander {
        private final TestPlan plan;
        private final PlanSettings s;
        private final UnitDeclaration unit;
        private final double startMw;
        private final List<ProgrammeStep> steps = new ArrayList<>();
        private final List<String> problems = new ArrayList<>();
        private long cursorMs;
        private double positionMw;
        private double maxExcursionMw;

        Expander(TestPlan plan, UnitDeclaration unit, double startMw) {
            this.plan = plan;
            this.s = plan.settings();
            this.unit = unit;
            this.startMw = startMw;
            this.positionMw = startMw;
            this.cursorMs = Math.round(s.leadInS() * 1000);
        }

        PulseProgramme run() {
            if (startMw < unit.regulatingMinMw() || startMw > unit.regulatingMaxMw()) {
                problems.add(String.format(Locale.ROOT, "unit %s is at %.2f MW, outside its regulating range "
                        + "[%.2f, %.2f] MW: the test cannot start", unit.unit(), startMw, unit.regulatingMinMw(),
                        unit.regulatingMaxMw()));
            }
            for (PlanStep step : plan.steps()) {
                expand(step);
            }
            if (!problems.isEmpty()) {
                throw new PlanException(problems);
            }
            return new PulseProgramme(unit, startMw, steps, cursorMs, maxExcursionMw);
        }

        private void expand(PlanStep step) {
            double range = unit.regulatingRangeMw();
            switch (step.kind()) {
                case HOLD -> {
                    long len = Math.round(step.durationS() * 1000);
                    add(step, step.label(), List.of(), 0, 0, -1, len, 0);
                }
                case STAIRCASE -> {
                    double mw = step.size().toMw(range);
                    for (int i = 0; i < step.count(); i++) {
                        move(step, step.label() + " " + (i + 1) + "/" + step.count(), step.direction(), mw);
                    }
                }
                case RAMP_TO_LIMIT -> {
                    double margin = step.size().toMw(range);
                    double target = step.direction() == PulseDirection.RAISE
                            ? unit.regulatingMaxMw() - margin : unit.regulatingMinMw() + margin;
                    double out = Math.abs(target - positionMw);
                    if ((target - positionMw) * sign(step.direction()) <= 0) {
                        problem(step, String.format(Locale.ROOT, "the limit less its margin (%.2f MW) is not %s "
                                + "the output expected there (%.2f MW)", target,
                                step.direction() == PulseDirection.RAISE ? "above" : "below", positionMw));
                        return;
                    }
                    move(step, step.label() + " out", step.direction(), out);
                    move(step, step.label() + " back", opposite(step.direction()), out);
                }
                case SHORT_PULSES -> {
                    double mw = unit.pulseRateMwPerMin() * step.pulseMs() / 60_000.0;
                    for (int i = 0; i < step.count(); i++) {
                        long at = cursorMs;
                        List<TimedPulse> pulses = List.of(new TimedPulse(at, step.direction(), step.pulseMs()));
                        long moveMs = Math.max(step.pulseMs(), rampMs(mw));
                        double change = mw * sign(step.direction());
                        double shortRamp = Math.min(unit.rampMwPerMin(), unit.pulseRateMwPerMin());
                        add(step, step.label() + " " + (i + 1) + "/" + step.count(), pulses, change, shortRamp, -1,
                                window(moveMs), moveMs);
                    }
                }
                case REVERSAL -> {
                    double mw = step.size().toMw(range);
                    long at = cursorMs;
                    List<TimedPulse> pulses = new ArrayList<>(train(at, step.direction(), mw));
                    long reverseAt = pulses.get(pulses.size() - 1).endOffsetMs() + s.pulseGapMs();
                    pulses.addAll(train(reverseAt, opposite(step.direction()), mw));
                    long trainMs = pulses.get(pulses.size() - 1).endOffsetMs() - at;
                    checkRange(step, positionMw + mw * sign(step.direction()));
                    long moveMs = Math.max(trainMs, 2 * rampMs(mw));
                    add(step, step.label(), pulses, 0, 0, reverseAt, window(moveMs), moveMs);
                }
                default -> throw new IllegalStateException(step.kind().toString());
            }
        }

        private void move(PlanStep step, String label, PulseDirection direction, double mw) {
            List<TimedPulse> pulses = train(cursorMs, direction, mw);
            double requested = sign(direction) * totalMs(pulses) * unit.pulseRateMwPerMin() / 60_000.0;
            long trainMs = pulses.get(pulses.size() - 1).endOffsetMs() - cursorMs;
            long moveMs = Math.max(trainMs, rampMs(mw));
            double referenceRate = Math.abs(requested) / (trainMs / 60_000.0);
            double expectedRamp = Math.min(unit.rampMwPerMin(), referenceRate);
            checkRange(step, positionMw + requested);
            add(step, label, pulses, requested, expectedRamp, -1, window(moveMs), moveMs);
        }

        private void add(PlanStep step, String label, List<TimedPulse> pulses, double change, double expectedRamp,
                long reverseAt, long windowMs, long moveMs) {
            steps.add(new ProgrammeStep(steps.size(), label, step.kind(), step.direction(), cursorMs,
                    cursorMs + windowMs, pulses, change, positionMw, moveMs, expectedRamp, reverseAt));
            cursorMs += windowMs;
            positionMw += change;
            maxExcursionMw = Math.max(maxExcursionMw, Math.abs(positionMw - startMw));
        }

        private List<TimedPulse> train(long atMs, PulseDirection direction, double mw) {
            long totalMs = Math.max(1, Math.round(mw / unit.pulseRateMwPerMin() * 60_000.0));
            List<TimedPulse> pulses = new ArrayList<>();
            long at = atMs;
            while (totalMs > 0) {
                long len = Math.min(totalMs, s.maxPulseMs());
                pulses.add(new TimedPulse(at, direction, len));
                at += len + s.pulseGapMs();
                totalMs -= len;
            }
            return pulses;
        }

        private void checkRange(PlanStep step, double targetMw) {
            maxExcursionMw = Math.max(maxExcursionMw, Math.abs(targetMw - startMw));
            if (targetMw > unit.regulatingMaxMw() + 1e-9 || targetMw < unit.regulatingMinMw() - 1e-9) {
                problem(step, String.format(Locale.ROOT, "asks for %.2f MW, outside the regulating range "
                        + "[%.2f, %.2f] MW of unit %s (starting from %.2f MW)", targetMw, unit.regulatingMinMw(),
                        unit.regulatingMaxMw(), unit.unit(), startMw));
            }
        }

        private long window(long moveMs) {
            return Math.round(moveMs * s.waitFactor() + s.extraWaitS() * 1000);
        }

        private long rampMs(double mw) {
            return Math.round(mw / unit.rampMwPerMin() * 60_000.0);
        }

        private void problem(PlanStep step, String message) {
            problems.add(step.at() + ": plan step " + step.label() + ": " + message);
        }

        private static long totalMs(List<TimedPulse> pulses) {
            return pulses.stream().mapToLong(TimedPulse::durationMs).sum();
        }
    }

    static double sign(PulseDirection d) {
        return d == PulseDirection.RAISE ? 1 : -1;
    }

    static PulseDirection opposite(PulseDirection d) {
        return d == PulseDirection.RAISE ? PulseDirection.LOWER : PulseDirection.RAISE;
    }
}
