package org.loopstand.plant.runtime;

import java.util.List;
import java.util.Set;

import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.Qos;

/**
 * How a plant process runs.
 *
 * @param rate             scenario seconds per wall second (1 = real time); informs the clock topic
 * @param remoteUnits      units whose plant interface runs in another process (field topics)
 * @param grouping         how in-process units share connections
 * @param poolSize         connections for {@link ConnectionGrouping#POOLED}, ≥ 1
 * @param meters           area meters (at least one per area is usual; none is allowed)
 * @param interfaces       plant-interface options for every unit
 * @param telemetryQos     QoS of meter and telemetry messages
 * @param commandQueueCapacity bounded intake per unit, ≥ 1
 * @param seed             meter noise seed
 * @param lateWarnS        step lateness that triggers the one "falling behind" warning, s
 */
public record PlantOptions(double rate, Set<String> remoteUnits, ConnectionGrouping grouping, int poolSize,
                           List<MeterSettings> meters, InterfaceOptions interfaces, Qos telemetryQos,
                           int commandQueueCapacity, long seed, double lateWarnS) {
    public PlantOptions {
        remoteUnits = Set.copyOf(remoteUnits);
        meters = List.copyOf(meters);
        if (poolSize < 1) {
            throw new IllegalArgumentException("poolSize must be at least 1, got " + poolSize);
        }
        if (commandQueueCapacity < 1) {
            throw new IllegalArgumentException("commandQueueCapacity must be at least 1, got " + commandQueueCapacity);
        }
    }
}
