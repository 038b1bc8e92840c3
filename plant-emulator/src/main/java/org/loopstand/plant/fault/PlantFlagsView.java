package org.loopstand.plant.fault;

import java.util.List;
import java.util.function.Predicate;

/** {@link PlantFaultFlags} of one unit read live from the engine's active faults. */
final class PlantFlagsView implements PlantFaultFlags {
    private final FaultEngine engine;
    private final String unit;

    PlantFlagsView(FaultEngine engine, String unit) {
        this.engine = engine;
        this.unit = unit;
    }

    private boolean any(Predicate<PlantFault> effect) {
        return plantFaults().stream().anyMatch(effect);
    }

    private List<PlantFault> plantFaults() {
        return engine.active(FaultCategory.PLANT, TargetKind.UNIT, unit).stream()
                .map(FaultSpec::behaviour).filter(PlantFault.class::isInstance).map(PlantFault.class::cast).toList();
    }

    @Override
    public boolean ignorePulses() {
        return any(PlantFault::ignoresPulses);
    }

    @Override
    public double slowFactor() {
        return plantFaults().stream().mapToDouble(PlantFault::slowFactor).max().orElse(1.0);
    }

    @Override
    public boolean swapRaiseLower() {
        return any(PlantFault::swapsRaiseLower);
    }

    @Override
    public boolean tripRequested() {
        return engine.tripOrdered(unit);
    }

    @Override
    public boolean forcedLocal() {
        return any(PlantFault::forcesLocal);
    }

    @Override
    public boolean applyExpiredCommands() {
        return any(PlantFault::appliesExpiredCommands);
    }
}
