package org.loopstand.plant.field;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.protocol.message.UnitStatus;

/** A turbine field wired straight to the simulator; only for the thread that owns the simulator. */
public final class DirectTurbineField implements TurbineField {
    private final GridSimulator sim;
    private final PhysicsEpoch physicsEpoch;
    private final int unit;
    private final String unitId;

    /** @param physicsEpoch gives the readings their time (the simulator's, not the clock's) */
    public DirectTurbineField(GridSimulator sim, PhysicsEpoch physicsEpoch, String unitId) {
        this.sim = sim;
        this.physicsEpoch = physicsEpoch;
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
    public long readingTimeMs() {
        return physicsEpoch.nowEpochMs();
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
