package org.loopstand.plant.unit;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;

import org.loopstand.plant.grid.GeneratingUnit;

/**
 * Everything a unit's plant interface needs to know about itself. Built with {@link #of} from the
 * site's unit and the plant-wide interface options.
 *
 * @param unitId              unit id
 * @param regulatingMinMw     lowest load reference the controller may cause, MW
 * @param regulatingMaxMw     highest load reference the controller may cause, MW, ≥ min
 * @param rampMwPerMin        rate at which a setpoint moves the load reference, MW/min, &gt; 0
 * @param pulseRateMwPerMin   load-reference change per minute of pulse, MW/min, &gt; 0
 * @param acceptsSetpoints    false: setpoint commands are refused
 * @param maxPulseMs          longest pulse taken, ms, in [1, 600000]
 * @param telemetryScanMs     telemetry scan period, ms, ≥ 10
 * @param watchdogS           controller heartbeat timeout, s (scenario time), &gt; 0
 * @param watchdogAction      hold or return to the base point
 * @param basePointMw         base point for {@link WatchdogAction#BASE_POINT}, MW, inside the regulating range
 * @param acceptedControllers controller ids whose commands are taken (non-empty)
 */
public record UnitSettings(String unitId, double regulatingMinMw, double regulatingMaxMw, double rampMwPerMin,
                           double pulseRateMwPerMin, boolean acceptsSetpoints, long maxPulseMs, long telemetryScanMs,
                           double watchdogS, WatchdogAction watchdogAction, double basePointMw,
                           Set<String> acceptedControllers) {
    public UnitSettings {
        acceptedControllers = Set.copyOf(acceptedControllers);
        List<String> problems = new ArrayList<>();
        if (!(regulatingMinMw <= regulatingMaxMw)) {
            problems.add("regulatingMinMw " + regulatingMinMw + " MW is above regulatingMaxMw " + regulatingMaxMw + " MW");
        }
        if (!(rampMwPerMin > 0)) {
            problems.add("rampMwPerMin must be > 0, got " + rampMwPerMin);
        }
        if (!(pulseRateMwPerMin > 0)) {
            problems.add("pulseRateMwPerMin must be > 0, got " + pulseRateMwPerMin);
        }
        if (maxPulseMs < 1 || maxPulseMs > 600_000) {
            problems.add("maxPulseMs must be in [1, 600000], got " + maxPulseMs);
        }
        if (telemetryScanMs < 10) {
            problems.add("telemetryScanMs must be at least 10 ms, got " + telemetryScanMs);
        }
        if (!(watchdogS > 0)) {
            problems.add("watchdogS must be > 0, got " + watchdogS);
        }
        if (watchdogAction == null) {
            problems.add("watchdogAction is missing");
        }
        if (!(basePointMw >= regulatingMinMw && basePointMw <= regulatingMaxMw)) {
            problems.add("basePointMw " + basePointMw + " MW lies outside the regulating range");
        }
        if (acceptedControllers.isEmpty()) {
            problems.add("acceptedControllers must name at least one controller id");
        }
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("unit " + unitId + ": " + String.join("; ", problems));
        }
    }

    /** Builds a unit's settings from the site and the plant-wide options; base point = initial output. */
    public static UnitSettings of(GeneratingUnit unit, InterfaceOptions options) {
        double base = Math.max(unit.regulatingMinMw(), Math.min(unit.regulatingMaxMw(), unit.initialOutputMw()));
        return new UnitSettings(unit.id(), unit.regulatingMinMw(), unit.regulatingMaxMw(), unit.rampMwPerMin(),
                unit.pulseRateMwPerMin(), unit.acceptsSetpoints(), options.maxPulseMs(),
                options.telemetryScanMsFor(unit.id()), options.watchdogS(), options.watchdogAction(), base,
                options.acceptedControllers());
    }

    /** @return the value held inside the regulating range */
    public double clampMw(double mw) {
        return Math.max(regulatingMinMw, Math.min(regulatingMaxMw, mw));
    }
}
