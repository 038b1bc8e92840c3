package org.loopstand.plant.fault;

/** Where a fault acts: which stage of the plant side consults it. */
public enum FaultCategory {
    /** Messages not published: the publication stage drops them. */
    LOSS,
    /** Stale data: frozen values, frozen timestamps, repeated messages. */
    STALE,
    /** Delay, jitter, reordering, duplication, source clock errors. */
    TIMING,
    /** The published value differs from the truth (bias, drift, scale, sign, noise, spike, stuck, quality). */
    VALUE,
    /** The MQTT connection itself: disconnects and refused reconnects ({@link LinkFaultControl}). */
    CONNECTION,
    /** Commands on their way into the unit plant interface: dropped, delayed, duplicated. */
    COMMAND,
    /** The unit plant interface misbehaves ({@link PlantFaultFlags}). */
    PLANT,
    /** The network between two hosts: link cut, or delay and loss ({@link HostLinks}). */
    NETWORK
}
