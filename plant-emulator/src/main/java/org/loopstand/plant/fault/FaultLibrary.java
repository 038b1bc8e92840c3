package org.loopstand.plant.fault;

import static org.loopstand.plant.fault.ParameterSpec.choice;
import static org.loopstand.plant.fault.ParameterSpec.number;

import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * Every fault type with its parameters and its behaviour record (a {@link StreamFault},
 * {@link ValueFault}, {@link CommandFault}, {@link PlantFault}, {@link LinkFault} or {@link NetworkFault} whose components
 * are the type's own parameters): the one list read by the scenario loader, the live fault order
 * handler, the fault stages, {@code loopstand fault list} and docs/faults.md.
 */
public final class FaultLibrary {
    /** Meter point names other than tie ids. */
    public static final String POINT_FREQUENCY = "frequency";
    public static final String POINT_NET_INTERCHANGE = "netInterchange";
    /** Value of parameter {@code meter} meaning every meter of the area. */
    public static final String ALL_METERS = "*";

    private static final Set<TargetKind> STREAMS = Set.of(TargetKind.AREA, TargetKind.UNIT);
    private static final Set<TargetKind> UNITS = Set.of(TargetKind.UNIT);
    private static final Set<TargetKind> LINKS = Set.of(TargetKind.CONNECTION);
    private static final Set<TargetKind> HOSTS = Set.of(TargetKind.HOST);
    private static final ParameterSpec METER = choice("meter", ALL_METERS, List.of(),
            "area targets: which meter of the area (\"*\" = every meter)");
    private static final ParameterSpec POINT = choice("point", POINT_FREQUENCY, List.of(),
            "area targets: frequency, netInterchange or a tie id; unit targets always act on outputMw");

    private static final FaultLibrary STANDARD = buildStandard();

    private final Map<String, FaultType> types;

    private FaultLibrary(Collection<FaultType> list) {
        Map<String, FaultType> m = new LinkedHashMap<>();
        for (FaultType t : list) {
            if (m.putIfAbsent(t.name(), t) != null) {
                throw new IllegalArgumentException("fault type '" + t.name() + "' is defined twice");
            }
        }
        this.types = m;
    }

    public static FaultLibrary standard() {
        return STANDARD;
    }

    public Optional<FaultType> type(String name) {
        return Optional.ofNullable(types.get(name));
    }

    public Collection<FaultType> types() {
        return types.values();
    }

    public Set<String> names() {
        return types.keySet();
    }

    private static FaultLibrary buildStandard() {
        List<FaultType> t = new ArrayList<>();
        // loss
        t.add(stream("drop", StreamFaults.Drop.class, FaultCategory.LOSS, null, "each publication is dropped with a probability",
                number("dropProbability", "", 0, 1, 1.0, "chance that one message is dropped")));
        t.add(stream("burstLoss", StreamFaults.BurstLoss.class, FaultCategory.LOSS, null, "messages are lost in bursts",
                number("burstStartProbability", "", 0, 1, 0.05, "chance, per message, that a burst starts"),
                number("burstLengthMessages", "messages", 1, 10_000, 5.0, "messages lost per burst")));
        t.add(stream("blackout", StreamFaults.Blackout.class, FaultCategory.LOSS, "stale", "nothing is published during the window"));
        // stale
        t.add(stream("freezeValue", StreamFaults.FreezeValue.class, FaultCategory.STALE, "stale",
                "values freeze at their last truth; seq and sourceTime advance, quality stays good"));
        t.add(stream("freezeTimestamp", StreamFaults.FreezeTimestamp.class, FaultCategory.STALE, "stale",
                "sourceTime stops at its value when the fault starts; values stay live"));
        t.add(stream("repeatLast", StreamFaults.RepeatLast.class, FaultCategory.STALE, "stale",
                "the publisher repeats its last message byte for byte (same seq and sourceTime)"));
        // timing
        t.add(stream("delay", StreamFaults.Delay.class, FaultCategory.TIMING, null, "each message is held back by a fixed delay plus jitter",
                number("delayMs", "ms", 0, 600_000, 1000.0, "fixed delay"),
                number("jitterMs", "ms", 0, 600_000, 0.0, "extra delay drawn uniformly from [0, jitterMs]")));
        t.add(stream("reorder", StreamFaults.Reorder.class, FaultCategory.TIMING, null, "some messages are held so that later ones overtake them",
                number("reorderProbability", "", 0, 1, 0.3, "chance that one message is held back"),
                number("holdMs", "ms", 1, 600_000, 3000.0, "how long a held message waits")));
        t.add(stream("duplicate", StreamFaults.Duplicate.class, FaultCategory.TIMING, null, "messages are published more than once",
                number("duplicateProbability", "", 0, 1, 1.0, "chance that one message is duplicated"),
                number("copies", "messages", 1, 10, 1.0, "extra copies of a duplicated message")));
        t.add(stream("clockOffset", StreamFaults.ClockOffset.class, FaultCategory.TIMING, null, "the source clock is off by a fixed amount",
                number("offsetMs", "ms", -86_400_000, 86_400_000, 5000.0, "added to sourceTime")));
        t.add(stream("clockDrift", StreamFaults.ClockDrift.class, FaultCategory.TIMING, null, "the source clock drifts from the fault start on",
                number("driftMsPerS", "ms/s", -1000, 1000, 10.0, "sourceTime error grows by this much per second")));
        // value
        t.add(value("bias", ValueFault.Bias.class, "a constant error is added",
                number("offsetMw", "MW", -100_000, 100_000, 0.0, "added to a MW point"),
                number("offsetMhz", "mHz", -5000, 5000, 0.0, "added to a frequency")));
        t.add(value("drift", ValueFault.Drift.class, "an error that grows from the fault start on",
                number("driftMwPerMin", "MW/min", -10_000, 10_000, 0.0, "growth of a MW point's error"),
                number("driftMhzPerMin", "mHz/min", -1000, 1000, 0.0, "growth of a frequency's error")));
        t.add(value("scale", ValueFault.Scale.class, "the value is multiplied by a factor (e.g. 1000 for kW sent as MW)",
                number("factor", "", -1_000_000, 1_000_000, 1000.0, "multiplier (for a frequency: of its deviation from nominal)")));
        t.add(value("signFlip", ValueFault.SignFlip.class, "the sign is reversed (a tie meter wired the wrong way round)"));
        t.add(value("noise", ValueFault.Noise.class, "extra Gaussian noise on the value",
                number("sigmaMw", "MW", 0, 10_000, 10.0, "standard deviation on a MW point"),
                number("sigmaMhz", "mHz", 0, 1000, 20.0, "standard deviation on a frequency")));
        t.add(value("spike", ValueFault.Spike.class, "the first messages in the window carry a large error",
                number("spikeMw", "MW", -100_000, 100_000, 500.0, "error on a MW point"),
                number("spikeMhz", "mHz", -5000, 5000, 500.0, "error on a frequency"),
                number("spikeMessages", "messages", 1, 1000, 1.0, "messages that carry the spike")));
        t.add(typeWith("stuckAt", ValueFault.StuckAt.class, FaultCategory.VALUE, STREAMS, "override", "the value is held at a fixed number, quality good",
                METER, POINT,
                number("valueMw", "MW", -1_000_000, 1_000_000, Double.NaN, "value of a MW point (required for MW points)"),
                number("valueHz", "Hz", 40, 70, Double.NaN, "value of a frequency (required for frequency)")));
        t.add(typeWith("holdLast", ValueFault.HoldLast.class, FaultCategory.VALUE, STREAMS, "override",
                "one point keeps the value it had when the fault started; seq, sourceTime, quality and the "
                        + "other points stay live", METER, POINT));
        t.add(typeWith("quality", ValueFault.QualityOverride.class, FaultCategory.VALUE, STREAMS, "quality", "the value's quality is replaced",
                METER, POINT,
                choice("validity", "invalid", List.of("questionable", "invalid"), "validity published"),
                choice("flag", "none", List.of("none", "overflow", "outOfRange", "badReference", "oscillatory",
                        "failure", "oldData", "inconsistent", "inaccurate", "substituted", "test", "operatorBlocked"),
                        "detail flag added (none = no flag)")));
        // connection
        ParameterSpec refuse = number("refuseReconnectS", "s", 0, 86_400, Double.NaN,
                "reconnects refused for this long (absent = until the fault ends)");
        t.add(typeWith("disconnectAbrupt", LinkFault.DisconnectAbrupt.class, FaultCategory.CONNECTION, LINKS, "link",
                "the connection is cut without DISCONNECT: the broker fires the last will", refuse));
        t.add(typeWith("disconnectClean", LinkFault.DisconnectClean.class, FaultCategory.CONNECTION, LINKS, "link",
                "the connection sends DISCONNECT and closes: no last will", refuse));
        // command path
        t.add(typeWith("commandDrop", CommandFault.Drop.class, FaultCategory.COMMAND, UNITS, null, "commands to the unit are lost on the way in",
                number("dropProbability", "", 0, 1, 1.0, "chance that one command is lost")));
        t.add(typeWith("commandDelay", CommandFault.Delay.class, FaultCategory.COMMAND, UNITS, null, "commands reach the unit late",
                number("delayMs", "ms", 0, 600_000, 5000.0, "fixed delay"),
                number("jitterMs", "ms", 0, 600_000, 0.0, "extra delay drawn uniformly from [0, jitterMs]")));
        t.add(typeWith("commandDuplicate", CommandFault.Duplicate.class, FaultCategory.COMMAND, UNITS, null, "commands reach the unit more than once",
                number("duplicateProbability", "", 0, 1, 1.0, "chance that one command is duplicated"),
                number("copies", "messages", 1, 10, 1.0, "extra copies")));
        // plant
        t.add(plant("applyExpired", PlantFault.ApplyExpired.class, "the unit acts on commands even after validUntil (and acks them accepted)"));
        t.add(plant("ignorePulses", PlantFault.IgnorePulses.class, "the unit acks pulses but its load reference does not move"));
        t.add(typeWith("slowResponse", PlantFault.SlowResponse.class, FaultCategory.PLANT, UNITS, null, "the unit follows its commands slowly",
                number("slowFactor", "", 1, 100, 4.0, "pulse rate and ramp rate are divided by this")));
        t.add(plant("swapRaiseLower", PlantFault.SwapRaiseLower.class, "raise and lower are swapped in the unit's wiring"));
        t.add(plant("plantTrip", PlantFault.PlantTrip.class, "the unit trips at the fault start (the physics truth trips too)"));
        t.add(plant("switchToLocal", PlantFault.SwitchToLocal.class, "the unit goes to local control: it refuses commands with notInRemote"));
        // network between two hosts (HostLinks)
        t.add(typeWith("partition", NetworkFault.Partition.class, FaultCategory.NETWORK, HOSTS, "network",
                "the link between two hosts is cut (link down) for the window"));
        t.add(typeWith("linkDelayLoss", NetworkFault.DelayLoss.class, FaultCategory.NETWORK, HOSTS, "network",
                "packets between two hosts are delayed and lost (netem; refused where the kernel has none)",
                number("delayMs", "ms", 0, 60_000, 100.0, "fixed delay each way"),
                number("jitterMs", "ms", 0, 60_000, 0.0, "extra delay, up to this much"),
                number("lossProbability", "", 0, 1, 0.0, "chance that one packet is lost")));
        return new FaultLibrary(t);
    }

    private static FaultType stream(String name, Class<? extends StreamFault> behaviour, FaultCategory c, String group,
            String text, ParameterSpec... p) {
        List<ParameterSpec> all = new ArrayList<>();
        all.add(METER);
        all.addAll(List.of(p));
        return new FaultType(name, c, STREAMS, all, group, text, behaviour);
    }

    private static FaultType value(String name, Class<? extends ValueFault> behaviour, String text, ParameterSpec... p) {
        List<ParameterSpec> all = new ArrayList<>(List.of(METER, POINT));
        all.addAll(List.of(p));
        return new FaultType(name, FaultCategory.VALUE, STREAMS, all, null, text, behaviour);
    }

    private static FaultType plant(String name, Class<? extends PlantFault> behaviour, String text) {
        return new FaultType(name, FaultCategory.PLANT, UNITS, List.of(), null, text, behaviour);
    }

    private static FaultType typeWith(String name, Class<? extends FaultBehaviour> behaviour, FaultCategory c,
            Set<TargetKind> kinds, String group, String text, ParameterSpec... p) {
        return new FaultType(name, c, kinds, List.of(p), group, text, behaviour);
    }
}
