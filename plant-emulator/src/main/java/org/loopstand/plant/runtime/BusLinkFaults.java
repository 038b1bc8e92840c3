package org.loopstand.plant.runtime;

import org.loopstand.plant.fault.LinkFaultControl;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.time.Clock;

/**
 * Connection faults on a real connection: an {@link MqttLink} (abrupt = the socket is closed without
 * DISCONNECT, so the broker fires the last will; clean = DISCONNECT; the reconnect loop is held while
 * reconnecting is refused) or an {@link InMemoryBus} (dropped with or without its will, reconnected
 * when the refusal ends). The refusal is timed on the plant's clock (scenario time) and ended in
 * {@link #poll()}, which the fault engine calls on the plant thread.
 */
public final class BusLinkFaults implements LinkFaultControl {
    private final MessageBus bus;
    private final Clock clock;
    /** epoch ms (plant clock) from which reconnecting is allowed again; MAX_VALUE = until told */
    private long refuseUntilMs = Long.MIN_VALUE;
    private boolean refusing;

    private BusLinkFaults(MessageBus bus, Clock clock) {
        this.bus = bus;
        this.clock = clock;
    }

    /** @return a control for {@code bus}, or null when its kind cannot be cut (the publication stage then emulates the outage) */
    public static BusLinkFaults forBus(MessageBus connection, Clock clock) {
        MessageBus bus = PublisherThread.unwrap(connection); // cut the connection itself, not the queue in front of it
        return bus instanceof MqttLink || bus instanceof InMemoryBus ? new BusLinkFaults(bus, clock) : null;
    }

    @Override
    public void disconnectAbruptly() {
        holdFirst();
        if (bus instanceof MqttLink m) {
            m.disconnectAbruptly();
        } else if (bus instanceof InMemoryBus b) {
            b.drop(true);
        }
    }

    @Override
    public void disconnectCleanly() {
        holdFirst();
        if (bus instanceof MqttLink m) {
            m.disconnectCleanly();
        } else if (bus instanceof InMemoryBus b) {
            b.drop(false);
        }
    }

    /** The reconnect loop must be held before the cut, or it may reconnect before the refusal is set. */
    private void holdFirst() {
        refusing = true;
        refuseUntilMs = Long.MAX_VALUE;
        if (bus instanceof MqttLink m) {
            m.holdReconnect(true);
        }
    }

    @Override
    public void refuseReconnectForS(double refuseS) {
        if (!(refuseS > 0)) {
            allow();
            return;
        }
        refusing = true;
        refuseUntilMs = Double.isInfinite(refuseS) ? Long.MAX_VALUE : clock.epochMillis() + Math.round(refuseS * 1000);
        if (bus instanceof MqttLink m) {
            m.holdReconnect(true);
        }
    }

    @Override
    public int poll() {
        if (refusing && refuseUntilMs != Long.MAX_VALUE && clock.epochMillis() >= refuseUntilMs) {
            allow();
            return 1;
        }
        return 0;
    }

    private void allow() {
        refusing = false;
        refuseUntilMs = Long.MIN_VALUE;
        if (bus instanceof MqttLink m) {
            m.holdReconnect(false);
        } else if (bus instanceof InMemoryBus b && !b.isConnected()) {
            try {
                b.reconnect();
            } catch (IllegalStateException e) {
                // closed for good (the plant is shutting down): nothing to reconnect
            }
        }
    }

    /** @return whether reconnecting is refused now */
    public boolean refusing() {
        return refusing;
    }
}
