package org.loopstand.plant.unit;

import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.UnitTelemetry;

/** Where a plant interface sends what it publishes; the bus adapter is {@code plant.runtime.ControlCentreLink}. */
public interface UnitOutput {
    void telemetry(UnitTelemetry telemetry);

    void ack(CommandAck ack);
}
