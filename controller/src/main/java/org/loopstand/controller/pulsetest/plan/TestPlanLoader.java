package org.loopstand.controller.pulsetest.plan;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import org.loopstand.protocol.message.PulseDirection;

/**
 * Loads a unit response test plan from YAML. Unknown keys are refused; every problem found is
 * reported at once, each naming file and line.
 */
public final class TestPlanLoader {
    private static final Set<String> TOP = Set.of("name", "description", "settings", "limits", "tolerances", "steps");
    private static final Set<String> SETTINGS = Set.of("leadInS", "noiseThresholdMw", "averagingS", "settleBandPct",
            "settleBandMinMw", "maxPulseMs", "pulseGapMs", "waitFactor", "extraWaitS", "commandValidityMs",
            "telemetryLossScans", "settledForS", "settleTimeoutS", "steadyForS", "steadyOutputBandMw",
            "steadyFrequencyBandHz", "steadyTimeoutS");
    private static final Set<String> LIMITS = Set.of("maxExcursionMw", "maxDurationS");
    private static final Set<String> TOLERANCES = Set.of("deadTimeMaxS", "rampPct", "gainPct", "shortPulseGainPct",
            "overshootMaxPct", "settlingAllowanceS", "finalErrorPct", "finalErrorMinMw", "holdDriftMaxMw",
            "asymmetryMaxPct");

    private TestPlanLoader() {
    }

    /** @throws PlanException naming every problem */
    public static TestPlan load(Path file) {
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new PlanException(List.of(file + ": cannot read the plan file: " + e.getMessage()));
        }
        return parse(text, file.toString());
    }

    /**
     * @param text   YAML text
     * @param source file name used in messages
     * @throws PlanException naming every problem
     */
    public static TestPlan parse(String text, String source) {
        PlanNode root = PlanYaml.parse(text, source);
        List<String> problems = new ArrayList<>();
        if (!(root instanceof PlanNode.MapNode rootMap)) {
            throw new PlanException(List.of(source + ":" + root.line() + ": the plan must be a mapping with name, steps, ..."));
        }
        MapReader top = new MapReader(rootMap, source, "plan", problems);
        top.refuseUnknown(TOP);
        String name = top.text("name", null);
        if (name == null || name.isBlank()) {
            top.problem(rootMap.line(), "plan.name is missing");
        }
        String description = top.text("description", "");
        PlanSettings settings = settings(sub(top, "settings", source, problems), PlanSettings.DEFAULTS);
        PlanLimits limits = limits(top, source, problems);
        Tolerances tolerances = tolerances(sub(top, "tolerances", source, problems), Tolerances.DEFAULTS);
        List<PlanStep> steps = steps(top, source, problems);
        if (!problems.isEmpty()) {
            throw new PlanException(problems);
        }
        return new TestPlan(name, description, settings, limits, tolerances, steps);
    }

    private static MapReader sub(MapReader parent, String key, String source, List<String> problems) {
        PlanNode n = parent.node(key);
        if (n == null) {
            return null;
        }
        if (n instanceof PlanNode.MapNode m) {
            return new MapReader(m, source, key, problems);
        }
        parent.problem(parent.lineOf(key), "plan." + key + " must be a mapping");
        return null;
    }

    private static PlanSettings settings(MapReader r, PlanSettings d) {
        if (r == null) {
            return d;
        }
        r.refuseUnknown(SETTINGS);
        return new PlanSettings(
                r.number("leadInS", d.leadInS(), 0, 3600),
                r.positive("noiseThresholdMw", d.noiseThresholdMw(), 100),
                r.positive("averagingS", d.averagingS(), 600),
                r.number("settleBandPct", d.settleBandPct(), 0, 100),
                r.positive("settleBandMinMw", d.settleBandMinMw(), 100),
                r.whole("maxPulseMs", d.maxPulseMs(), 1, 600_000),
                r.whole("pulseGapMs", d.pulseGapMs(), 0, 60_000),
                r.number("waitFactor", d.waitFactor(), 1, 10),
                r.number("extraWaitS", d.extraWaitS(), 0, 3600),
                r.whole("commandValidityMs", d.commandValidityMs(), 100, 60_000),
                (int) r.whole("telemetryLossScans", d.telemetryLossScans(), 1, 100),
                r.positive("settledForS", d.settledForS(), 600),
                r.number("settleTimeoutS", d.settleTimeoutS(), 0, 3600),
                r.positive("steadyForS", d.steadyForS(), 3600),
                r.positive("steadyOutputBandMw", d.steadyOutputBandMw(), 100),
                r.positive("steadyFrequencyBandHz", d.steadyFrequencyBandHz(), 5),
                r.number("steadyTimeoutS", d.steadyTimeoutS(), 0, 3600));
    }

    private static PlanLimits limits(MapReader top, String source, List<String> problems) {
        MapReader r = sub(top, "limits", source, problems);
        if (r == null) {
            if (!top.has("limits")) {
                top.problem(1, "plan.limits is missing: a plan must cap maxExcursionMw and maxDurationS");
            }
            return new PlanLimits(1, 1);
        }
        r.refuseUnknown(LIMITS);
        for (String k : LIMITS) {
            if (!r.has(k)) {
                r.problem(top.lineOf("limits"), "limits." + k + " is missing");
            }
        }
        return new PlanLimits(r.positive("maxExcursionMw", 1, 10_000), r.positive("maxDurationS", 1, 86_400));
    }

    private static Tolerances tolerances(MapReader r, Tolerances d) {
        if (r == null) {
            return d;
        }
        r.refuseUnknown(TOLERANCES);
        return new Tolerances(
                r.positive("deadTimeMaxS", d.deadTimeMaxS(), 3600),
                r.positive("rampPct", d.rampPct(), 1000),
                r.positive("gainPct", d.gainPct(), 1000),
                r.positive("shortPulseGainPct", d.shortPulseGainPct(), 1000),
                r.number("overshootMaxPct", d.overshootMaxPct(), 0, 1000),
                r.number("settlingAllowanceS", d.settlingAllowanceS(), 0, 3600),
                r.number("finalErrorPct", d.finalErrorPct(), 0, 1000),
                r.positive("finalErrorMinMw", d.finalErrorMinMw(), 1000),
                r.positive("holdDriftMaxMw", d.holdDriftMaxMw(), 1000),
                r.positive("asymmetryMaxPct", d.asymmetryMaxPct(), 1000));
    }

    private static List<PlanStep> steps(MapReader top, String source, List<String> problems) {
        List<PlanStep> steps = new ArrayList<>();
        PlanNode n = top.node("steps");
        if (!(n instanceof PlanNode.ListNode list) || list.items().isEmpty()) {
            top.problem(n == null ? 1 : n.line(), "plan.steps must be a non-empty list of steps");
            return steps;
        }
        for (int i = 0; i < list.items().size(); i++) {
            PlanNode item = list.items().get(i);
            String where = "steps[" + i + "]";
            if (!(item instanceof PlanNode.MapNode m)) {
                problems.add(source + ":" + item.line() + ": " + where + " must be a mapping with a 'kind'");
                continue;
            }
            PlanStep s = step(new MapReader(m, source, where, problems), m.line(), where);
            if (s != null) {
                steps.add(s);
            }
        }
        return steps;
    }

    private static PlanStep step(MapReader r, int line, String where) {
        String kindName = r.text("kind", null);
        StepKind kind = StepKind.fromYaml(kindName);
        if (kind == null) {
            r.problem(line, where + ".kind " + (kindName == null ? "is missing" : "'" + kindName + "' is unknown")
                    + " (one of hold, staircase, rampToLimit, shortPulses, reversal)");
            return null;
        }
        Set<String> allowed = switch (kind) {
            case HOLD -> Set.of("kind", "label", "durationS");
            case STAIRCASE -> Set.of("kind", "label", "direction", "stepMw", "stepPct", "count");
            case RAMP_TO_LIMIT -> Set.of("kind", "label", "direction", "marginMw", "marginPct");
            case SHORT_PULSES -> Set.of("kind", "label", "direction", "pulseMs", "count");
            case REVERSAL -> Set.of("kind", "label", "direction", "stepMw", "stepPct");
        };
        r.refuseUnknown(allowed);
        PulseDirection direction = null;
        if (kind != StepKind.HOLD) {
            String d = r.text("direction", null);
            if (d == null) {
                r.problem(line, where + ".direction is missing (raise or lower)");
            } else {
                try {
                    direction = PulseDirection.valueOf(d.toUpperCase(Locale.ROOT));
                } catch (IllegalArgumentException e) {
                    r.problem(r.lineOf("direction"), where + ".direction '" + d + "' must be raise or lower");
                }
            }
        }
        StepSize size = switch (kind) {
            case STAIRCASE, REVERSAL -> size(r, line, where, "stepMw", "stepPct");
            case RAMP_TO_LIMIT -> size(r, line, where, "marginMw", "marginPct");
            default -> null;
        };
        int count = 1;
        if (kind == StepKind.STAIRCASE || kind == StepKind.SHORT_PULSES) {
            count = (int) r.whole("count", 1, 1, 100);
        }
        double durationS = 0;
        if (kind == StepKind.HOLD) {
            if (!r.has("durationS")) {
                r.problem(line, where + ".durationS is missing");
            }
            durationS = r.positive("durationS", 1, 86_400);
        }
        long pulseMs = 0;
        if (kind == StepKind.SHORT_PULSES) {
            if (!r.has("pulseMs")) {
                r.problem(line, where + ".pulseMs is missing");
            }
            pulseMs = r.whole("pulseMs", 1000, 1, 600_000);
        }
        String label = r.text("label", defaultLabel(kind, direction));
        return new PlanStep(kind, line, label, direction, size, count, durationS, pulseMs);
    }

    private static StepSize size(MapReader r, int line, String where, String mwKey, String pctKey) {
        boolean mw = r.has(mwKey);
        boolean pct = r.has(pctKey);
        if (mw == pct) {
            r.problem(line, where + " needs exactly one of " + mwKey + " or " + pctKey);
            return new StepSize(1, false);
        }
        return mw ? new StepSize(r.positive(mwKey, 1, 10_000), false)
                : new StepSize(r.positive(pctKey, 1, 100), true);
    }

    private static String defaultLabel(StepKind kind, PulseDirection direction) {
        return direction == null ? kind.yamlName() : kind.yamlName() + " " + direction.name().toLowerCase(Locale.ROOT);
    }
}
