package org.loopstand.plant.fault;

import java.util.List;

/** {@link PlantFaultFlags} of one unit read live from the engine's active faults. */
final class PlantFlagsView implements PlantFaultFlags {
    private final FaultEngine engine;
    private final String unit;

    PlantFlagsView(FaultEngine engine, String unit) {
        this.engine = engine;
        this.unit = unit;
    }

    private boolean has(String type) {
        return plantFaults().stream().anyMatch(f -> f.type().name().equals(type));
    }

    private List<FaultSpec> plantFaults() {
        return engine.active(FaultCategory.PLANT, TargetKind.UNIT, unit);
    }

    @Override
    public boolean ignorePulses() {
        return has("ignorePulses");
    }

    @Override
    public double slowFactor() {
        return plantFaults().stream().filter(f -> f.type().name().equals("slowResponse"))
                .mapToDouble(f -> f.number("slowFactor")).max().orElse(1.0);
    }

    @Override
    public boolean swapRaiseLower() {
        return has("swapRaiseLower");
    }

    @Override
    public boolean tripRequested() {
        return engine.tripOrdered(unit);
    }

    @Override
    public boolean forcedLocal() {
        return has("switchToLocal");
    }

    @Override
    public boolean applyExpiredCommands() {
        return has("applyExpired");
    }
}
