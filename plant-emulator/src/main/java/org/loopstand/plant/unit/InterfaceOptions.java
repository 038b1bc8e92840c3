package org.loopstand.plant.unit;

import java.util.Map;
import java.util.Set;

/**
 * Plant-wide options for every unit's plant interface (the per-unit figures come from the site).
 *
 * @param maxPulseMs          longest pulse taken, ms, in [1, 600000]
 * @param telemetryScanMs     default telemetry scan period, ms
 * @param telemetryScanMsByUnit per-unit overrides of the scan period, ms
 * @param watchdogS           controller heartbeat timeout, s of scenario time
 * @param watchdogAction      hold or return to the base point
 * @param acceptedControllers controller ids whose commands are taken
 */
public record InterfaceOptions(long maxPulseMs, long telemetryScanMs, Map<String, Long> telemetryScanMsByUnit,
                               double watchdogS, WatchdogAction watchdogAction, Set<String> acceptedControllers) {
    /** Default controller id accepted when nothing else is configured. */
    public static final String DEFAULT_CONTROLLER = "controller-1";
    /** Controller id the unit response test ({@code pulse-test}) sends with; the plant command accepts it by default. */
    public static final String RESPONSE_TEST_CONTROLLER = "pulse-test";

    public InterfaceOptions {
        telemetryScanMsByUnit = Map.copyOf(telemetryScanMsByUnit);
        acceptedControllers = Set.copyOf(acceptedControllers);
    }

    /** 60 s longest pulse, 2 s telemetry, 30 s watchdog holding, controller {@value #DEFAULT_CONTROLLER}. */
    public static InterfaceOptions defaults() {
        return new InterfaceOptions(60_000, 2_000, Map.of(), 30.0, WatchdogAction.HOLD, Set.of(DEFAULT_CONTROLLER));
    }

    public long telemetryScanMsFor(String unitId) {
        return telemetryScanMsByUnit.getOrDefault(unitId, telemetryScanMs);
    }

    public InterfaceOptions withMaxPulseMs(long v) {
        return new InterfaceOptions(v, telemetryScanMs, telemetryScanMsByUnit, watchdogS, watchdogAction, acceptedControllers);
    }

    public InterfaceOptions withTelemetryScanMs(long v, Map<String, Long> byUnit) {
        return new InterfaceOptions(maxPulseMs, v, byUnit, watchdogS, watchdogAction, acceptedControllers);
    }

    public InterfaceOptions withWatchdog(double s, WatchdogAction action) {
        return new InterfaceOptions(maxPulseMs, telemetryScanMs, telemetryScanMsByUnit, s, action, acceptedControllers);
    }

    public InterfaceOptions withAcceptedControllers(Set<String> ids) {
        return new InterfaceOptions(maxPulseMs, telemetryScanMs, telemetryScanMsByUnit, watchdogS, watchdogAction, ids);
    }
}
