package org.loopstand.bench.run;

import java.nio.file.Path;
import org.loopstand.plant.runtime.ConnectionGrouping;

/**
 * One bench run.
 *
 * @param units              units in the generated site, ≥ areas
 * @param areas              areas, ≥ 1
 * @param durationS          measured wall time after the warm-up, s, > 0
 * @param warmupS            wall time before measuring starts, s, ≥ 0
 * @param broker             {@code embedded}, {@code mosquitto} or a tcp:// URL
 * @param brokerConfig       Mosquitto config the harness copies when it starts its own
 * @param grouping           plant connection grouping
 * @param poolSize           connections for the pooled grouping, ≥ 1
 * @param intakeConnections  controller connections sharing the intake subscriptions, ≥ 1
 * @param telemetryScanMs    unit telemetry period, ms, {@value #MIN_SCAN_MS}..{@value #MAX_SCAN_MS}
 * @param meterScanMs        area meter period, ms, the same range
 * @param cycleS             controller cycle, s
 * @param sampleS            heap/CPU sample period, s, > 0
 * @param raw                run the raw Paho loop beside the rig
 * @param wakeOnInput        the intake wakes the controller's runner on every queued message
 *                           (false: the runner's 1 ms idle park alone, for comparison)
 * @param unitScanMs         plant unit interface scan period, ms (0: every physics step)
 * @param loadStepMw         load step in the first area at 5 s and every 60 s, alternating sign, MW (0: none)
 * @param outDir             run folder (created)
 * @param layout             plant and controller in the bench's JVM, or each in a process of its own
 * @param rawPacing          how the raw loop spaces its messages
 * @param partJvmOpts        JVM options of the plant and controller processes (layout processes), split
 *                           on spaces; {@code {role}} is replaced by {@code plant} or {@code controller}
 * @param brokerUser         MQTT login of every bench connection, empty for none; its password is in
 *                           {@link #BROKER_PASSWORD_FILE} of the run folder (layout hosts)
 * @param fieldScanMs        layout hosts: period of the plant's field readings to the unit hosts, ms, ≥ 1 (the
 *                           plant's default is 200)
 * @param plantPacing        where and how the plant publishes (layouts one-jvm and processes)
 */
public record BenchSettings(int units, int areas, double durationS, double warmupS, String broker, Path brokerConfig,
                            ConnectionGrouping grouping, int poolSize, int intakeConnections, long telemetryScanMs,
                            long meterScanMs, int cycleS, double sampleS, boolean raw, boolean wakeOnInput,
                            long unitScanMs, double loadStepMw, Path outDir, Layout layout, RawPacing rawPacing,
                            String partJvmOpts, String brokerUser,
                            long fieldScanMs, PlantPublishing plantPacing) {
    /** The file in the run folder whose first line is the password of {@link #brokerUser}. */
    public static final String BROKER_PASSWORD_FILE = "broker-login.password";
    /** The controller's default age limit of unit telemetry and meter readings, ms (ControllerSettings). */
    public static final long CONTROLLER_TELEMETRY_AGE_MS = 10_000;
    /** Longest field reading period (layout hosts), ms. */
    public static final long MAX_FIELD_SCAN_MS = 60_000;
    /** Shortest telemetry and meter period, ms. */
    public static final long MIN_SCAN_MS = 10;
    /**
     * Longest telemetry and meter period, ms: the controller takes an area meter reading for at most 10 s (its inputs'
     * default age limit), so a longer period leaves an area stale between readings; 9 s leaves a second for the way
     * there. (Unit telemetry: see {@link #unitTelemetryMaxAgeMs}.)
     */
    public static final long MAX_SCAN_MS = 9_000;

    /** Where plant and controller run. */
    public enum Layout {
        /** plant, controller, raw loop (and the embedded broker) share the bench's JVM and one clock */
        ONE_JVM,
        /** plant and controller each in a JVM of their own, as in production; the raw loop in the bench's */
        PROCESSES,
        /**
         * three-node broker cluster on network-namespace hosts, the plant, the units' interfaces on two unit
         * hosts and the controller each on a host ({@link HostsBench}); no raw loop
         */
        HOSTS;

        public String cliName() {
            return this == ONE_JVM ? "one-jvm" : name().toLowerCase(java.util.Locale.ROOT);
        }

        public static Layout parse(String text) {
            for (Layout l : values()) {
                if (l.cliName().equals(text)) {
                    return l;
                }
            }
            throw new IllegalArgumentException("--layout must be one-jvm, processes or hosts, got " + text);
        }
    }

    /** How the raw loop spaces its messages. */
    public enum RawPacing {
        /** evenly, in 1 ms slots */
        SPREAD,
        /** as the plant publishes: all of a physics step's messages in one burst per step */
        BURST;

        public String cliName() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }

        public static RawPacing parse(String text) {
            return byCliName(values(), RawPacing::cliName, text, "--raw-pacing must be spread or burst");
        }
    }

    /** Where and how the plant publishes. */
    public enum PlantPublishing {
        /** on the physics thread, each step's due telemetry one message after the other (as before the option) */
        LOOP,
        /** through the plant's publisher thread, each message as soon as it is taken (the step's burst) */
        BURST,
        /** through the publisher thread, each step's unit telemetry spread evenly over the step */
        SPREAD;

        public String cliName() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }

        public static PlantPublishing parse(String text) {
            return byCliName(values(), PlantPublishing::cliName, text, "--plant-pacing must be loop, burst or spread");
        }
    }

    /** @throws IllegalArgumentException "{@code refusal}, got {@code text}" when no value is called {@code text} */
    private static <E> E byCliName(E[] values, java.util.function.Function<E, String> cliName, String text, String refusal) {
        for (E v : values) {
            if (cliName.apply(v).equals(text)) {
                return v;
            }
        }
        throw new IllegalArgumentException(refusal + ", got " + text);
    }

    /** The settings with the plant publishing on its physics thread ({@link PlantPublishing#LOOP}). */
    public BenchSettings(int units, int areas, double durationS, double warmupS, String broker, Path brokerConfig,
                         ConnectionGrouping grouping, int poolSize, int intakeConnections, long telemetryScanMs,
                         long meterScanMs, int cycleS, double sampleS, boolean raw, boolean wakeOnInput,
                         long unitScanMs, double loadStepMw, Path outDir, Layout layout, RawPacing rawPacing,
                         String partJvmOpts, String brokerUser, long fieldScanMs) {
        this(units, areas, durationS, warmupS, broker, brokerConfig, grouping, poolSize, intakeConnections, telemetryScanMs,
                meterScanMs, cycleS, sampleS, raw, wakeOnInput, unitScanMs, loadStepMw, outDir, layout, rawPacing,
                partJvmOpts, brokerUser, fieldScanMs, PlantPublishing.LOOP);
    }

    public BenchSettings {
        if (units < 1 || areas < 1 || units < areas) {
            throw new IllegalArgumentException("need units ≥ areas ≥ 1, got units " + units + ", areas " + areas);
        }
        if (!(durationS > 0) || warmupS < 0 || !(sampleS > 0)) {
            throw new IllegalArgumentException("duration and sample period must be > 0, warm-up ≥ 0");
        }
        if (telemetryScanMs < MIN_SCAN_MS || telemetryScanMs > MAX_SCAN_MS || meterScanMs < MIN_SCAN_MS
                || meterScanMs > MAX_SCAN_MS) {
            throw new IllegalArgumentException("telemetry and meter periods must be " + MIN_SCAN_MS + ".." + MAX_SCAN_MS
                    + " ms (the controller's 10 s age limit), got " + telemetryScanMs + " and " + meterScanMs);
        }
        if (fieldScanMs < 1 || fieldScanMs > MAX_FIELD_SCAN_MS) {
            throw new IllegalArgumentException("field scan period must be ≥ 1 ms and ≤ " + MAX_FIELD_SCAN_MS + " ms, got "
                    + fieldScanMs);
        }
        if (poolSize < 1 || intakeConnections < 1) {
            throw new IllegalArgumentException("pool size and intake connections must be ≥ 1");
        }
        if (layout == null || rawPacing == null || partJvmOpts == null || brokerUser == null || plantPacing == null) {
            throw new IllegalArgumentException("layout, raw pacing, plant pacing, part JVM options and broker user are required");
        }
    }

    /**
     * Layout hosts: a unit's telemetry reports the turbine reading the plant last sent it and carries that reading's
     * time, so its age at the controller reaches the field period plus the telemetry period plus the way through the
     * cluster (4 s allowed here, seen up to ≈ 1 s at load 26). The generated site sets the controller's
     * {@code unitTelemetryMaxAgeMs} to that when it is above the controller's 10 s default, so that slower periods
     * chosen to fit the cluster do not make every unit ineligible; a real site with slow scans must do the same.
     *
     * @return the unit telemetry age limit the generated site asks of the controller, ms
     */
    public long unitTelemetryMaxAgeMs() {
        long needed = layout == Layout.HOSTS ? telemetryScanMs + fieldScanMs + 4_000 : telemetryScanMs + 4_000;
        return Math.max(CONTROLLER_TELEMETRY_AGE_MS, needed);
    }

    /** @return total measured-value messages per second the plant sends (telemetry + meters) */
    public double plantRatePerS() {
        return units * 1000.0 / telemetryScanMs + areas * 1000.0 / meterScanMs;
    }
}
