package org.loopstand.controller.config;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.function.Supplier;
import org.loopstand.controller.ace.AceConvention;
import org.loopstand.controller.ace.AceMode;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.intake.FallbackPolicy;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.safety.InterlockSettings;

/**
 * Reads the part of a site file the controller needs: area ids, ACE convention and bias, nominal
 * frequency, ties, units' areas, cost curves and regulating limits, and the optional strict {@code
 * controller:} section. Physics-only keys are ignored. Every problem is reported at once, each with
 * {@code file:line}.
 */
public final class ControllerSiteReader {
    private final List<String> problems = new ArrayList<>();
    private final LocatedYaml yaml;
    /** every area id written in the file, also of areas refused for another reason */
    private final Set<String> declaredAreas = new HashSet<>();

    private ControllerSiteReader(LocatedYaml yaml) {
        this.yaml = yaml;
    }

    /** @throws ControllerConfigException naming every problem with file:line */
    public static ControllerSiteConfig read(Path file) {
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new ControllerConfigException(List.of(file + ": cannot read: " + e.getMessage()));
        }
        return read(file.toString(), text);
    }

    /** @param fileName used in messages only */
    public static ControllerSiteConfig read(String fileName, String text) {
        return new ControllerSiteReader(LocatedYaml.parse(fileName, text)).read();
    }

    private ControllerSiteConfig read() {
        Section site = new Section(yaml, yaml.root(), "", "the site", problems);
        String siteId = site.requiredString("siteId");
        List<SiteArea> areas = new ArrayList<>();
        Set<String> areaIds = new HashSet<>();
        for (Section a : site.list("areas", true)) {
            SiteArea area = readArea(a);
            if (area != null && !areaIds.add(area.id())) {
                a.fail("area id '" + area.id() + "' appears twice");
            } else if (area != null) {
                areas.add(area);
            }
        }
        List<SiteTie> ties = new ArrayList<>();
        for (Section t : site.list("ties", false)) {
            String id = t.requiredString("id");
            String from = t.requiredString("fromArea");
            String to = t.requiredString("toArea");
            double sched = t.dbl("scheduledFlowMw", 0.0);
            checkArea(t, "fromArea", from, declaredAreas);
            checkArea(t, "toArea", to, declaredAreas);
            if (id != null && from != null && to != null) {
                ties.add(new SiteTie(id, from, to, sched));
            }
        }
        List<SiteUnit> units = new ArrayList<>();
        for (Section u : site.list("units", false)) {
            String id = u.requiredString("id");
            String area = u.requiredString("area");
            checkArea(u, "area", area, declaredAreas);
            double rating = u.dbl("ratingMw", Double.NaN);
            double min = u.dbl("regulatingMinMw", u.dbl("minOutputMw", 0.0));
            double max = u.dbl("regulatingMaxMw", u.dbl("maxOutputMw", Double.isNaN(rating) ? Double.NaN : rating));
            double c = u.dbl("costC", 0.0);
            double deadBandHz = u.dbl("deadBandHz", 0.0);
            if (!(deadBandHz >= 0 && deadBandHz < 1)) {
                u.fail("deadBandHz", "must be in [0, 1) Hz, got " + deadBandHz);
                deadBandHz = 0.0;
            }
            if (c > 0 && !(min <= max)) {
                u.fail("needs regulating limits (regulatingMinMw/regulatingMaxMw or ratingMw) for its cost curve");
            }
            if (id != null && area != null) {
                double droop = u.dbl("droopPct", Double.NaN);
                double lagS = GovernorResponse.rampLagS(u.string("turbine", ""), u.dbl("governorTimeConstantS", 0.0),
                        u.dbl("turbineTimeConstantS", 0.0), u.dbl("steamChestTimeConstantS", 0.0),
                        u.dbl("reheatTimeConstantS", 0.0), u.dbl("hpFraction", 1.0), u.dbl("waterStartingTimeS", 0.0),
                        u.dbl("transientDroopPct", Double.NaN), droop, u.dbl("resetTimeS", 0.0));
                units.add(new SiteUnit(id, area, u.dbl("costA", 0.0), u.dbl("costB", 0.0), c, min, max, rating,
                        droop, deadBandHz, lagS));
            }
        }
        double f0 = areas.isEmpty() ? 50.0 : areas.get(0).nominalFrequencyHz();
        ControllerSettings settings = readSettings(site.section("controller"), f0);
        if (!problems.isEmpty()) {
            throw new ControllerConfigException(problems);
        }
        return new ControllerSiteConfig(siteId, areas, ties, units, settings);
    }

    private SiteArea readArea(Section a) {
        String id = a.requiredString("id");
        if (id != null) {
            declaredAreas.add(id);
        }
        double f0 = a.requiredDouble("nominalFrequencyHz");
        String conv = a.string("aceConvention", "european");
        AceConvention convention;
        double bias;
        switch (conv) {
            case "european" -> {
                convention = AceConvention.EUROPEAN;
                bias = a.requiredDouble("kMwPerHz");
            }
            case "northAmerican" -> {
                convention = AceConvention.NORTH_AMERICAN;
                bias = a.requiredDouble("biasMwPer01Hz");
            }
            default -> {
                a.fail("aceConvention", "must be 'european' or 'northAmerican', got '" + conv + "'");
                return null;
            }
        }
        if (id == null || Double.isNaN(f0) || Double.isNaN(bias)) {
            return null;
        }
        // the ACE settings check the sign of the bias and the frequency range
        AreaControlSettings.Builder b = AreaControlSettings.builder(id).nominalFrequencyHz(f0);
        if (convention == AceConvention.EUROPEAN) {
            b.europeanK(bias);
        } else {
            b.northAmericanBias(bias);
        }
        if (!attempt(a, b::build)) {
            return null;
        }
        return new SiteArea(id, convention, bias, f0);
    }

    private void checkArea(Section s, String key, String area, Set<String> known) {
        if (area != null && !known.isEmpty() && !known.contains(area)) {
            s.fail(key, "names unknown area '" + area + "' (known: " + known + ")");
        }
    }

    private ControllerSettings readSettings(Section c, double f0) {
        ControllerSettings d = ControllerSettings.defaults(f0);
        double cycleS = c.dbl("cycleS", d.cycleMs() / 1000.0);
        long cycleMs = Math.round(cycleS * 1000);
        if (cycleMs < 1000 || cycleMs > 10_000) {
            c.fail("cycleS", "must be in [1, 10] s, got " + cycleS);
            cycleMs = d.cycleMs();
        }
        String modeText = c.string("aceMode", "tieLineBias");
        AceMode mode = switch (modeText) {
            case "tieLineBias" -> AceMode.TIE_LINE_BIAS;
            case "flatFrequency" -> AceMode.FLAT_FREQUENCY;
            case "flatTieLine" -> AceMode.FLAT_TIE_LINE;
            default -> {
                c.fail("aceMode", "must be tieLineBias, flatFrequency or flatTieLine, got '" + modeText + "'");
                yield AceMode.TIE_LINE_BIAS;
            }
        };
        Section r = c.section("regulation");
        RegulationSettings dr = d.regulation();
        final double cs = cycleMs / 1000.0;
        RegulationSettings reg = build(r, () -> RegulationSettings.builder().cycleS(cs)
                .filterTimeConstantS(r.dbl("filterTimeConstantS", dr.filterTimeConstantS()))
                .kp(r.dbl("kp", dr.kp())).integralTimeS(r.dbl("integralTimeS", dr.integralTimeS()))
                .quietMw(r.dbl("quietMw", dr.quietMw())).assistMw(r.dbl("assistMw", dr.assistMw())).build(), dr);
        Section p = c.section("pulses");
        PulseSettings dp = d.pulses();
        PulseSettings pulses = build(p, () -> new PulseSettings(p.lng("minPulseMs", dp.minPulseMs()),
                p.lng("maxPulseMs", dp.maxPulseMs()), p.bool("preferSetpoints", dp.preferSetpoints()),
                p.dbl("minSetpointChangeMw", dp.minSetpointChangeMw())), dp);
        Section i = c.section("interlock");
        InterlockSettings di = d.interlock();
        InterlockSettings interlock = build(i, () -> new InterlockSettings(
                i.dbl("aceSanityLimitMw", di.aceSanityLimitMw()),
                (int) i.lng("resumeAfterClearCycles", di.resumeAfterClearCycles())), di);
        Section f = c.section("following");
        FollowingSettings df = d.following();
        FollowingSettings following = build(f, () -> new FollowingSettings(f.lng("deadTimeMs", df.deadTimeMs()),
                f.dbl("toleranceMw", df.toleranceMw()), (int) f.lng("missedCyclesToFlag", df.missedCyclesToFlag()),
                (int) f.lng("followedCyclesToReturn", df.followedCyclesToReturn()),
                f.lng("governorSettleMs", df.governorSettleMs()), f.lng("probeIntervalMs", df.probeIntervalMs()),
                f.dbl("probeMw", df.probeMw())), df);
        long settleMs = c.lng("commandSettleMs", d.commandSettleMs());
        if (settleMs < 0) {
            c.fail("commandSettleMs", "must be >= 0 ms, got " + settleMs);
        }
        Section rd = c.section("redispatch");
        long redispatchMs = Math.round(rd.dbl("periodS", 0) * 1000);
        double share = rd.dbl("rampShare", d.redispatchRampShare());
        if (redispatchMs < 0 || !(share > 0 && share <= 1)) {
            rd.fail("needs periodS >= 0 and rampShare in (0, 1]");
        }
        rd.finish();
        Section in = c.section("intake");
        InputRule freq = rule(in.section("frequency"), "Hz", d.frequency());
        InputRule tie = rule(in.section("tieFlow"), "Mw", d.tieFlow());
        long unitAge = in.lng("unitTelemetryMaxAgeMs", d.unitTelemetryMaxAgeMs());
        long skew = in.lng("clockSkewLimitMs", d.clockSkewLimitMs());
        int queue = (int) in.lng("queueCapacity", d.intakeQueueCapacity());
        boolean fromSite = in.bool("scheduleFromSite", d.scheduleFromSite());
        if (unitAge <= 0 || skew <= 0 || queue < 16) {
            in.fail("needs unitTelemetryMaxAgeMs > 0, clockSkewLimitMs > 0 and queueCapacity >= 16");
        }
        in.finish();
        c.finish();
        return new ControllerSettings(cycleMs, mode, reg, pulses, interlock, following, Math.max(0, settleMs),
                Math.max(0, redispatchMs), share > 0 && share <= 1 ? share : d.redispatchRampShare(), freq, tie,
                unitAge, skew, queue, fromSite);
    }

    private InputRule rule(Section s, String unit, InputRule d) {
        String policyText = s.string("policy", switch (d.policy()) {
            case HOLD_LAST_GOOD -> "holdLastGood";
            case ALTERNATE_SOURCE -> "alternateSource";
            default -> "declareUnusable";
        });
        FallbackPolicy policy = switch (policyText) {
            case "holdLastGood" -> FallbackPolicy.HOLD_LAST_GOOD;
            case "alternateSource" -> FallbackPolicy.ALTERNATE_SOURCE;
            case "declareUnusable" -> FallbackPolicy.DECLARE_UNUSABLE;
            default -> {
                s.fail("policy", "must be holdLastGood, alternateSource or declareUnusable, got '" + policyText + "'");
                yield d.policy();
            }
        };
        if (s.has("frozenCount")) {
            s.fail("frozenCount", "is replaced by frozenAfterMs (scenario ms the value must stay identical; a count of"
                    + " readings stretched with every lost scan) and frozenMinReadings");
        }
        double rate = s.dbl("maxRate" + unit + "PerS", 0);
        InputRule r = new InputRule(s.lng("maxAgeMs", d.maxAgeMs()), s.dbl("min" + unit, d.minValue()),
                s.dbl("max" + unit, d.maxValue()), rate > 0 ? rate : s.has("maxRate" + unit + "PerS")
                        ? Double.POSITIVE_INFINITY : d.maxRatePerS(),
                s.lng("frozenAfterMs", d.frozenAfterMs()), (int) s.lng("frozenMinReadings", d.frozenMinReadings()),
                s.dbl("frozenEpsilon" + unit, d.frozenEpsilon()), policy,
                s.lng("holdMs", d.holdMs()));
        s.finish();
        if (!attempt(s, () -> r.toSettings("check", 1000))) {
            return d;
        }
        return r;
    }

    private <T> T build(Section s, Supplier<T> builder, T dflt) {
        try {
            T v = builder.get();
            s.finish();
            return v;
        } catch (IllegalArgumentException e) {
            s.fail(e.getMessage());
            s.finish();
            return dflt;
        }
    }

    private boolean attempt(Section s, Supplier<?> builder) {
        try {
            builder.get();
            return true;
        } catch (IllegalArgumentException e) {
            s.fail(e.getMessage());
            return false;
        }
    }
}
