package org.loopstand.plant.runtime;

import org.loopstand.plant.field.RemoteUnitField;
import org.loopstand.protocol.agent.Agent;

/**
 * Drives one unit's plant interface in its own process: its commands, watchdog and telemetry on the
 * unit's own connection, its turbine reached over the field topics.
 */
public final class UnitAgent implements Agent {
    private final UnitHost host;
    private final RemoteUnitField field;
    private final OperatorOrders orders;

    public UnitAgent(UnitHost host, RemoteUnitField field, OperatorOrders orders) {
        this.host = host;
        this.field = field;
        this.orders = orders;
    }

    @Override
    public int doWork() {
        int work = orders.work() + host.work();
        field.resendIfDue();
        return work;
    }

    @Override
    public String roleName() {
        return "unit-" + host.unit().unitId();
    }

    public UnitHost host() {
        return host;
    }
}
