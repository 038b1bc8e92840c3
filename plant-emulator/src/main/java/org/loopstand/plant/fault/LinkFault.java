package org.loopstand.plant.fault;

/** A fault on an MQTT connection: how it is cut, and how long reconnects are refused. */
public interface LinkFault extends FaultBehaviour {
    /** Cuts the connection at the fault start. */
    void cut(LinkFaultControl link);

    /** @return reconnects refused for this long, s; NaN = until the fault ends */
    double refuseReconnectS();

    /** Cut without DISCONNECT: the broker fires the last will. */
    record DisconnectAbrupt(double refuseReconnectS) implements LinkFault {
        @Override
        public void cut(LinkFaultControl link) {
            link.disconnectAbruptly();
        }
    }

    /** DISCONNECT sent, then closed: no last will. */
    record DisconnectClean(double refuseReconnectS) implements LinkFault {
        @Override
        public void cut(LinkFaultControl link) {
            link.disconnectCleanly();
        }
    }
}
