package org.loopstand.plant.cli;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.plant.unit.WatchdogAction;
import org.loopstand.protocol.bus.Qos;
import picocli.CommandLine.Option;

/** Plant-interface options shared by {@code plant} and {@code unit}. */
public final class InterfaceMixin {
    @Option(names = "--accept-controller", split = ",", paramLabel = "ID",
            description = "controller ids whose commands are taken (default controller-1,pulse-test: the rig's"
                    + " controller and its unit response test)")
    List<String> acceptedControllers = List.of(InterfaceOptions.DEFAULT_CONTROLLER, InterfaceOptions.RESPONSE_TEST_CONTROLLER);

    @Option(names = "--watchdog-s", defaultValue = "30", description = "controller heartbeat timeout, s of scenario time (default ${DEFAULT-VALUE})")
    double watchdogS;

    @Option(names = "--watchdog-action", defaultValue = "hold", description = "hold or base-point (default ${DEFAULT-VALUE})")
    String watchdogAction;

    @Option(names = "--max-pulse-ms", defaultValue = "60000", description = "longest pulse taken, ms (default ${DEFAULT-VALUE})")
    long maxPulseMs;

    @Option(names = "--telemetry-scan-ms", defaultValue = "2000", description = "unit telemetry scan period, ms (default ${DEFAULT-VALUE})")
    long telemetryScanMs;

    @Option(names = "--telemetry-scan", paramLabel = "UNIT=MS", description = "scan period of one unit's telemetry, ms (repeatable)")
    Map<String, Long> telemetryScanByUnit = new LinkedHashMap<>();

    @Option(names = "--telemetry-qos", defaultValue = "0", description = "QoS of telemetry and meter messages, 0 or 1 (default ${DEFAULT-VALUE})")
    int telemetryQos;

    InterfaceOptions options() {
        WatchdogAction action = switch (watchdogAction) {
            case "hold" -> WatchdogAction.HOLD;
            case "base-point" -> WatchdogAction.BASE_POINT;
            default -> throw new IllegalArgumentException("--watchdog-action must be hold or base-point, got " + watchdogAction);
        };
        return InterfaceOptions.defaults().withMaxPulseMs(maxPulseMs).withTelemetryScanMs(telemetryScanMs, telemetryScanByUnit)
                .withWatchdog(watchdogS, action).withAcceptedControllers(Set.copyOf(acceptedControllers));
    }

    Qos qos() {
        return switch (telemetryQos) {
            case 0 -> Qos.AT_MOST_ONCE;
            case 1 -> Qos.AT_LEAST_ONCE;
            default -> throw new IllegalArgumentException("--telemetry-qos must be 0 or 1, got " + telemetryQos);
        };
    }
}
