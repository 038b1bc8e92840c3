package org.loopstand.controller.pulsetest.programme;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * What a unit is declared to do, from the site file or from its own telemetry.
 *
 * @param unit              unit id
 * @param regulatingMinMw   lower regulating limit, MW
 * @param regulatingMaxMw   upper regulating limit, MW, &gt; regulatingMinMw
 * @param rampMwPerMin      rate the output follows, MW/min, &gt; 0
 * @param pulseRateMwPerMin load reference movement per pulse time, MW/min, &gt; 0
 * @param source            where the figures come from, e.g. {@code site file config/sites/demo-site.yaml}
 */
public record UnitDeclaration(String unit, double regulatingMinMw, double regulatingMaxMw, double rampMwPerMin,
        double pulseRateMwPerMin, String source) {
    public UnitDeclaration {
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(source, "source");
        List<String> problems = new ArrayList<>();
        if (!(regulatingMaxMw > regulatingMinMw)) {
            problems.add("regulatingMaxMw " + regulatingMaxMw + " must exceed regulatingMinMw " + regulatingMinMw);
        }
        if (!(rampMwPerMin > 0)) {
            problems.add("rampMwPerMin must be > 0, got " + rampMwPerMin);
        }
        if (!(pulseRateMwPerMin > 0)) {
            problems.add("pulseRateMwPerMin must be > 0, got " + pulseRateMwPerMin);
        }
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("unit " + unit + " (" + source + "): " + String.join("; ", problems));
        }
    }

    /** @return regulating range width, MW */
    public double regulatingRangeMw() {
        return regulatingMaxMw - regulatingMinMw;
    }

    /** @return declared gain, MW per pulse-second */
    public double gainMwPerPulseS() {
        return pulseRateMwPerMin / 60.0;
    }
}
