package org.loopstand.plant.runtime;

import org.loopstand.plant.field.RemoteTurbineField;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.time.ClockSilenceWatch;

/**
 * The agent of a {@link UnitProcess}: drives one unit's plant interface in its own process (its commands,
 * watchdog and telemetry on the unit's own connection, its turbine reached over the field topics).
 */
public final class UnitProcessAgent implements Agent {
    private final UnitDutyCycle cycle;
    private final RemoteTurbineField field;
    private final OperatorOrders orders;
    private ClockSilenceWatch clockSilence;

    public UnitProcessAgent(UnitDutyCycle cycle, RemoteTurbineField field, OperatorOrders orders) {
        this.cycle = cycle;
        this.field = field;
        this.orders = orders;
    }

    /** Journals the silences of the plant's clock this unit follows ({@code --clock bus}); set before start. */
    void watchClockSilence(ClockSilenceWatch watch) {
        this.clockSilence = watch;
    }

    @Override
    public int doWork() {
        int work = (clockSilence == null ? 0 : clockSilence.poll()) + orders.work() + cycle.work();
        field.resendIfDue();
        return work;
    }

    @Override
    public String roleName() {
        return "unit-" + cycle.unit().unitId();
    }

    public UnitDutyCycle dutyCycle() {
        return cycle;
    }
}
