package org.loopstand.plant.fault;

/**
 * What a fault target id names. Target ids are plain ids of the wire contract; the kind is found by
 * looking the id up in the site ({@link TargetCatalog}).
 */
public enum TargetKind {
    /** An area: its meter publications (every meter of the area, or the one named by parameter {@code meter}). */
    AREA,
    /** A unit: its telemetry, its command path or its plant interface, depending on the fault type. */
    UNIT,
    /** A bus connection: a unit interface's ({@code unit id}) or the plant process's own ({@link TargetCatalog#PLANT_CONNECTION}). */
    CONNECTION,
    /** A host of the rig's layout, named in the plant's hosts file ({@link HostLinks#hosts()}). */
    HOST;

    public String wireName() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
