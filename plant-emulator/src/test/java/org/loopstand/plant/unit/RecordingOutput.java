package org.loopstand.plant.unit;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.UnitTelemetry;

final class RecordingOutput implements UnitOutput {
    final List<UnitTelemetry> telemetry = new ArrayList<>();
    final List<CommandAck> acks = new ArrayList<>();

    @Override public void telemetry(UnitTelemetry t) { telemetry.add(t); }
    @Override public void ack(CommandAck a) { acks.add(a); }

    CommandAck lastAck() {
        return acks.get(acks.size() - 1);
    }
}
