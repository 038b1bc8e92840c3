package org.loopstand.protocol.bus;

/** MQTT quality of service levels used by the rig (QoS 2 is not used: commands carry their own seq). */
public enum Qos {
    AT_MOST_ONCE(0),
    AT_LEAST_ONCE(1);

    private final int level;

    Qos(int level) {
        this.level = level;
    }

    /** @return the MQTT QoS number, 0 or 1 */
    public int level() {
        return level;
    }
}
