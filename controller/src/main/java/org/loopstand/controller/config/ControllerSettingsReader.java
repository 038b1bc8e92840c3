package org.loopstand.controller.config;

import java.util.function.Supplier;
import org.loopstand.controller.ace.AceMode;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.Range;

/**
 * Reads the strict {@code controller:} section of a site file (docs/controller.md) with the shared
 * {@link MappingReader}; an absent key keeps {@link ControllerSettings#defaults(double)}. Problems go
 * into the reader's list, each as {@code file:line:column: what}.
 */
final class ControllerSettingsReader {
    private ControllerSettingsReader() {
    }

    static ControllerSettings read(MappingReader c, double f0) {
        ControllerSettings d = ControllerSettings.defaults(f0);
        double cycleS = c.optionalDouble("cycleS", d.cycleMs() / 1000.0, Range.closed(1, 10));
        long cycleMs = Math.round(cycleS * 1000);
        String modeText = c.optionalChoice("aceMode", "tieLineBias", "tieLineBias", "flatFrequency", "flatTieLine");
        AceMode mode = switch (modeText) {
            case "flatFrequency" -> AceMode.FLAT_FREQUENCY;
            case "flatTieLine" -> AceMode.FLAT_TIE_LINE;
            default -> AceMode.TIE_LINE_BIAS;
        };
        MappingReader r = c.mapping("regulation", "controller.regulation");
        RegulationSettings dr = d.regulation();
        final double cs = cycleMs / 1000.0;
        RegulationSettings reg = build(r, () -> RegulationSettings.builder().cycleS(cs)
                .filterTimeConstantS(r.optionalDouble("filterTimeConstantS", dr.filterTimeConstantS()))
                .kp(r.optionalDouble("kp", dr.kp())).integralTimeS(r.optionalDouble("integralTimeS", dr.integralTimeS()))
                .quietMw(r.optionalDouble("quietMw", dr.quietMw()))
                .assistMw(r.optionalDouble("assistMw", dr.assistMw())).build(), dr);
        MappingReader p = c.mapping("pulses", "controller.pulses");
        PulseSettings dp = d.pulses();
        PulseSettings pulses = build(p, () -> new PulseSettings(p.optionalLong("minPulseMs", dp.minPulseMs()),
                p.optionalLong("maxPulseMs", dp.maxPulseMs()), p.optionalBoolean("preferSetpoints", dp.preferSetpoints()),
                p.optionalDouble("minSetpointChangeMw", dp.minSetpointChangeMw())), dp);
        MappingReader i = c.mapping("interlock", "controller.interlock");
        InterlockSettings di = d.interlock();
        InterlockSettings interlock = build(i, () -> new InterlockSettings(
                i.optionalDouble("aceSanityLimitMw", di.aceSanityLimitMw()),
                (int) i.optionalLong("resumeAfterClearCycles", di.resumeAfterClearCycles())), di);
        MappingReader f = c.mapping("following", "controller.following");
        FollowingSettings df = d.following();
        FollowingSettings following = build(f, () -> new FollowingSettings(
                f.optionalLong("deadTimeMs", df.deadTimeMs()), f.optionalDouble("toleranceMw", df.toleranceMw()),
                (int) f.optionalLong("missedCyclesToFlag", df.missedCyclesToFlag()),
                (int) f.optionalLong("followedCyclesToReturn", df.followedCyclesToReturn()),
                f.optionalLong("governorSettleMs", df.governorSettleMs()),
                f.optionalLong("probeIntervalMs", df.probeIntervalMs()), f.optionalDouble("probeMw", df.probeMw())), df);
        long settleMs = c.optionalLong("commandSettleMs", d.commandSettleMs());
        if (settleMs < 0) {
            c.fail("commandSettleMs", "must be >= 0 ms, got " + settleMs);
        }
        MappingReader rd = c.mapping("redispatch", "controller.redispatch");
        long redispatchMs = Math.round(rd.optionalDouble("periodS", 0) * 1000);
        double share = rd.optionalDouble("rampShare", d.redispatchRampShare());
        if (redispatchMs < 0 || !(share > 0 && share <= 1)) {
            rd.fail("needs periodS >= 0 and rampShare in (0, 1]");
        }
        rd.finish();
        MappingReader in = c.mapping("intake", "controller.intake");
        InputRule freq = rule(in.mapping("frequency", "controller.intake.frequency"), "Hz", d.frequency());
        InputRule tie = rule(in.mapping("tieFlow", "controller.intake.tieFlow"), "Mw", d.tieFlow());
        long unitAge = in.optionalLong("unitTelemetryMaxAgeMs", d.unitTelemetryMaxAgeMs());
        long skew = in.optionalLong("clockSkewLimitMs", d.clockSkewLimitMs());
        int queue = (int) in.optionalLong("queueCapacity", d.intakeQueueCapacity());
        boolean fromSite = in.optionalBoolean("scheduleFromSite", d.scheduleFromSite());
        if (unitAge <= 0 || skew <= 0 || queue < 16) {
            in.fail("needs unitTelemetryMaxAgeMs > 0, clockSkewLimitMs > 0 and queueCapacity >= 16");
        }
        in.finish();
        c.finish();
        return new ControllerSettings(cycleMs, mode, reg, pulses, interlock, following, Math.max(0, settleMs),
                Math.max(0, redispatchMs), share > 0 && share <= 1 ? share : d.redispatchRampShare(), freq, tie,
                unitAge, skew, queue, fromSite);
    }

    private static InputRule rule(MappingReader s, String unit, InputRule d) {
        String policyText = s.optionalChoice("policy", switch (d.policy()) {
            case HOLD_LAST_GOOD -> "holdLastGood";
            case ALTERNATE_SOURCE -> "alternateSource";
            default -> "declareUnusable";
        }, "holdLastGood", "alternateSource", "declareUnusable");
        FallbackPolicy policy = switch (policyText) {
            case "holdLastGood" -> FallbackPolicy.HOLD_LAST_GOOD;
            case "alternateSource" -> FallbackPolicy.ALTERNATE_SOURCE;
            default -> FallbackPolicy.DECLARE_UNUSABLE;
        };
        if (s.has("frozenCount")) {
            s.fail("frozenCount", "is replaced by frozenAfterMs (scenario ms the value must stay identical; a count of"
                    + " readings stretched with every lost scan) and frozenMinReadings");
        }
        String rateKey = "maxRate" + unit + "PerS";
        double rate = s.optionalDouble(rateKey, 0);
        InputRule r = new InputRule(s.optionalLong("maxAgeMs", d.maxAgeMs()),
                s.optionalDouble("min" + unit, d.minValue()), s.optionalDouble("max" + unit, d.maxValue()),
                rate > 0 ? rate : s.has(rateKey) ? Double.POSITIVE_INFINITY : d.maxRatePerS(),
                s.optionalLong("frozenAfterMs", d.frozenAfterMs()),
                (int) s.optionalLong("frozenMinReadings", d.frozenMinReadings()),
                s.optionalDouble("frozenEpsilon" + unit, d.frozenEpsilon()), policy, s.optionalLong("holdMs", d.holdMs()));
        s.finish();
        try {
            r.toSettings("check", 1000);
            return r;
        } catch (IllegalArgumentException e) {
            s.fail("is refused: " + e.getMessage());
            return d;
        }
    }

    private static <T> T build(MappingReader s, Supplier<T> builder, T dflt) {
        try {
            T v = builder.get();
            s.finish();
            return v;
        } catch (IllegalArgumentException e) {
            s.fail("is refused: " + e.getMessage());
            s.finish();
            return dflt;
        }
    }
}
