package org.loopstand.controller.pulsetest.plan;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.Range;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.message.PulseDirection;

/**
 * Loads a unit response test plan from YAML with the shared {@link MappingReader}. Unknown keys are
 * refused; every problem found is reported at once, each as {@code file:line:column: what}.
 */
public final class TestPlanLoader {
    private TestPlanLoader() {
    }

    /** @throws ConfigFileException naming every problem */
    public static TestPlan load(Path file) {
        return read(YamlNode.read(file));
    }

    /**
     * @param text   YAML text
     * @param source file name used in messages
     * @throws ConfigFileException naming every problem
     */
    public static TestPlan parse(String text, String source) {
        return read(YamlNode.read(source, text));
    }

    private static TestPlan read(YamlNode root) {
        List<String> problems = new ArrayList<>();
        MappingReader top = new MappingReader(root, "the plan", problems);
        String name = top.requiredString("name");
        String description = top.optionalString("description", "");
        PlanSettings settings = settings(top.mapping("settings", "settings"), PlanSettings.DEFAULTS);
        PlanLimits limits = limits(top);
        Tolerances tolerances = tolerances(top.mapping("tolerances", "tolerances"), Tolerances.DEFAULTS);
        List<PlanStep> steps = new ArrayList<>();
        List<YamlNode> items = top.sequence("steps", true);
        if (items.isEmpty() && !top.failed("steps")) {
            top.fail("steps", "must be a non-empty list of steps");
        }
        for (int i = 0; i < items.size(); i++) {
            PlanStep s = step(new MappingReader(items.get(i), "steps[" + i + "]", problems));
            if (s != null) {
                steps.add(s);
            }
        }
        top.finish();
        ConfigFileException.throwIfAny(problems);
        return new TestPlan(name, description, settings, limits, tolerances, steps);
    }

    private static PlanSettings settings(MappingReader r, PlanSettings d) {
        PlanSettings s = new PlanSettings(
                r.optionalDouble("leadInS", d.leadInS(), Range.closed(0, 3600)),
                r.optionalDouble("noiseThresholdMw", d.noiseThresholdMw(), Range.positive(100)),
                r.optionalDouble("averagingS", d.averagingS(), Range.positive(600)),
                r.optionalDouble("settleBandPct", d.settleBandPct(), Range.closed(0, 100)),
                r.optionalDouble("settleBandMinMw", d.settleBandMinMw(), Range.positive(100)),
                r.optionalLong("maxPulseMs", d.maxPulseMs(), Range.closed(1, 600_000)),
                r.optionalLong("pulseGapMs", d.pulseGapMs(), Range.closed(0, 60_000)),
                r.optionalDouble("waitFactor", d.waitFactor(), Range.closed(1, 10)),
                r.optionalDouble("extraWaitS", d.extraWaitS(), Range.closed(0, 3600)),
                r.optionalLong("commandValidityMs", d.commandValidityMs(), Range.closed(100, 60_000)),
                (int) r.optionalLong("telemetryLossScans", d.telemetryLossScans(), Range.closed(1, 100)),
                r.optionalDouble("settledForS", d.settledForS(), Range.positive(600)),
                r.optionalDouble("settleTimeoutS", d.settleTimeoutS(), Range.closed(0, 3600)),
                r.optionalDouble("steadyForS", d.steadyForS(), Range.positive(3600)),
                r.optionalDouble("steadyOutputBandMw", d.steadyOutputBandMw(), Range.positive(100)),
                r.optionalDouble("steadyFrequencyBandHz", d.steadyFrequencyBandHz(), Range.positive(5)),
                r.optionalDouble("steadyTimeoutS", d.steadyTimeoutS(), Range.closed(0, 3600)));
        r.finish();
        return s;
    }

    /** A plan must cap its excursion and duration; there is no default. */
    private static PlanLimits limits(MappingReader top) {
        if (!top.has("limits")) {
            top.missing("limits");
            return new PlanLimits(1, 1);
        }
        MappingReader r = top.mapping("limits", "limits");
        double excursion = r.requiredDouble("maxExcursionMw", Range.positive(10_000));
        double duration = r.requiredDouble("maxDurationS", Range.positive(86_400));
        r.finish();
        return new PlanLimits(Double.isNaN(excursion) ? 1 : excursion, Double.isNaN(duration) ? 1 : duration);
    }

    private static Tolerances tolerances(MappingReader r, Tolerances d) {
        Tolerances t = new Tolerances(
                r.optionalDouble("deadTimeMaxS", d.deadTimeMaxS(), Range.positive(3600)),
                r.optionalDouble("rampPct", d.rampPct(), Range.positive(1000)),
                r.optionalDouble("gainPct", d.gainPct(), Range.positive(1000)),
                r.optionalDouble("shortPulseGainPct", d.shortPulseGainPct(), Range.positive(1000)),
                r.optionalDouble("overshootMaxPct", d.overshootMaxPct(), Range.closed(0, 1000)),
                r.optionalDouble("settlingAllowanceS", d.settlingAllowanceS(), Range.closed(0, 3600)),
                r.optionalDouble("finalErrorPct", d.finalErrorPct(), Range.closed(0, 1000)),
                r.optionalDouble("finalErrorMinMw", d.finalErrorMinMw(), Range.positive(1000)),
                r.optionalDouble("holdDriftMaxMw", d.holdDriftMaxMw(), Range.positive(1000)),
                r.optionalDouble("asymmetryMaxPct", d.asymmetryMaxPct(), Range.positive(1000)));
        r.finish();
        return t;
    }

    private static PlanStep step(MappingReader r) {
        String kindName = r.requiredString("kind");
        StepKind kind = StepKind.fromYaml(kindName);
        if (kind == null) {
            if (kindName != null) {
                r.fail("kind", "'" + kindName + "' is unknown (one of hold, staircase, rampToLimit, shortPulses,"
                        + " reversal)");
            }
            return null;
        }
        PulseDirection direction = null;
        if (kind != StepKind.HOLD) {
            String d = r.optionalChoice("direction", null, "raise", "lower");
            if (d == null && !r.failed("direction")) {
                r.missing("direction");
            } else if (d != null) {
                direction = PulseDirection.valueOf(d.toUpperCase(Locale.ROOT));
            }
        }
        StepSize size = switch (kind) {
            case STAIRCASE, REVERSAL -> size(r, "stepMw", "stepPct");
            case RAMP_TO_LIMIT -> size(r, "marginMw", "marginPct");
            default -> null;
        };
        int count = 1;
        if (kind == StepKind.STAIRCASE || kind == StepKind.SHORT_PULSES) {
            count = (int) r.optionalLong("count", 1, Range.closed(1, 100));
        }
        double durationS = 0;
        if (kind == StepKind.HOLD) {
            durationS = r.requiredDouble("durationS", Range.positive(86_400));
        }
        long pulseMs = 0;
        if (kind == StepKind.SHORT_PULSES) {
            if (!r.has("pulseMs")) {
                r.missing("pulseMs");
            }
            pulseMs = r.optionalLong("pulseMs", 1000, Range.closed(1, 600_000));
        }
        String label = r.optionalString("label", defaultLabel(kind, direction));
        r.finish();
        return new PlanStep(kind, r.location(), label, direction, size, count, Double.isNaN(durationS) ? 1 : durationS,
                pulseMs);
    }

    private static StepSize size(MappingReader r, String mwKey, String pctKey) {
        boolean mw = r.has(mwKey);
        boolean pct = r.has(pctKey);
        if (mw == pct) {
            r.fail("needs exactly one of " + mwKey + " or " + pctKey);
            return new StepSize(1, false);
        }
        return mw ? new StepSize(r.optionalDouble(mwKey, 1, Range.positive(10_000)), false)
                : new StepSize(r.optionalDouble(pctKey, 1, Range.positive(100)), true);
    }

    private static String defaultLabel(StepKind kind, PulseDirection direction) {
        return direction == null ? kind.yamlName() : kind.yamlName() + " " + direction.name().toLowerCase(Locale.ROOT);
    }
}
