package org.loopstand.plant.field;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.message.UnitStatus;

/** A turbine field wired straight to the simulator; only for the thread that owns the simulator. */
public final class DirectTurbineField implements TurbineField {
    private final GridSimulator sim;
    private final int unit;
    private final String unitId;

    public DirectTurbineField(GridSimulator sim, String unitId) {
        this.sim = sim;
        this.unitId = unitId;
        this.unit = sim.grid().unitIndex(unitId);
    }

    @Override
    public boolean ready() {
        return true;
    }

    @Override
    public double outputMw() {
        return sim.outputMw(unit);
    }

    @Override
    public double loadReferenceMw() {
        return sim.loadReferenceMw(unit);
    }

    @Override
    public UnitStatus status() {
        // by index: a name look-up per tick and unit was the plant loop's top cost at 10,000 units
        if (sim.isTripped(unit)) {
            return UnitStatus.TRIPPED;
        }
        return sim.isOnline(unit) ? UnitStatus.ONLINE : UnitStatus.OFFLINE;
    }

    @Override
    public void writeLoadReferenceMw(double mw) {
        sim.setLoadReferenceMw(unit, mw);
    }

    /** @return the unit's status as the simulator has it */
    public static UnitStatus statusOf(GridSimulator sim, String unitId) {
        if (sim.isTripped(unitId)) {
            return UnitStatus.TRIPPED;
        }
        return sim.isOnline(unitId) ? UnitStatus.ONLINE : UnitStatus.OFFLINE;
    }
}
