package org.loopstand.plant.fault;

import java.util.List;

/**
 * {@link PlantFaultFlags} of one unit read from the engine's active faults. The unit interface reads
 * its flags after every step: the view reads the engine again only when its active faults changed
 * ({@link FaultEngine#generation()}), so the step's path allocates nothing. Loop thread only, like
 * the engine.
 */
final class PlantFlagsView implements PlantFaultFlags {
    private final FaultEngine engine;
    private final String unit;
    private long seenGeneration = -1;
    private boolean ignorePulses;
    private boolean swapRaiseLower;
    private boolean forcedLocal;
    private boolean applyExpired;
    private double slowFactor = 1.0;

    PlantFlagsView(FaultEngine engine, String unit) {
        this.engine = engine;
        this.unit = unit;
    }

    private void refresh() {
        long g = engine.generation();
        if (g == seenGeneration) {
            return;
        }
        seenGeneration = g;
        List<PlantFault> faults = engine.active(FaultCategory.PLANT, TargetKind.UNIT, unit).stream()
                .map(FaultSpec::behaviour).filter(PlantFault.class::isInstance).map(PlantFault.class::cast).toList();
        ignorePulses = faults.stream().anyMatch(PlantFault::ignoresPulses);
        swapRaiseLower = faults.stream().anyMatch(PlantFault::swapsRaiseLower);
        forcedLocal = faults.stream().anyMatch(PlantFault::forcesLocal);
        applyExpired = faults.stream().anyMatch(PlantFault::appliesExpiredCommands);
        slowFactor = faults.stream().mapToDouble(PlantFault::slowFactor).max().orElse(1.0);
    }

    @Override
    public boolean ignorePulses() {
        refresh();
        return ignorePulses;
    }

    @Override
    public double slowFactor() {
        refresh();
        return slowFactor;
    }

    @Override
    public boolean swapRaiseLower() {
        refresh();
        return swapRaiseLower;
    }

    @Override
    public boolean tripRequested() {
        return engine.tripOrdered(unit);
    }

    @Override
    public boolean forcedLocal() {
        refresh();
        return forcedLocal;
    }

    @Override
    public boolean applyExpiredCommands() {
        refresh();
        return applyExpired;
    }
}
