package org.loopstand.protocol.site;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;

/**
 * The one reader of site files (keys and units: docs/physics.md). It checks what the format itself
 * says: known keys, types, required keys for the {@link SiteUse}, the words of {@code aceConvention}
 * and {@code turbine}, one way of giving a tie. Every problem is named {@code file:line:column: what},
 * all at once. What a site means for the physics (limits, references between areas) is checked by
 * the plant's grid builder; what it means for control, by the controller.
 */
public final class SiteReader {
    private static final String[] TURBINE_KEYS = {"turbineTimeConstantS", "steamChestTimeConstantS",
        "reheatTimeConstantS", "hpFraction", "waterStartingTimeS", "transientDroopPct", "resetTimeS"};

    private final SiteUse use;
    private final List<String> problems;

    private SiteReader(SiteUse use, List<String> problems) {
        this.use = use;
        this.problems = problems;
    }

    /** @throws ConfigFileException naming every problem, when the file cannot be read or is not a valid site */
    public static SiteFile read(Path file, SiteUse use) {
        return read(YamlNode.read(file), use);
    }

    /**
     * @param fileName used in messages only
     * @throws ConfigFileException naming every problem
     */
    public static SiteFile read(String fileName, String text, SiteUse use) {
        return read(YamlNode.read(fileName, text), use);
    }

    private static SiteFile read(YamlNode root, SiteUse use) {
        List<String> problems = new ArrayList<>();
        SiteFile site = read(root, use, problems);
        ConfigFileException.throwIfAny(problems);
        return site;
    }

    /**
     * Reads a site and adds every problem to {@code problems} instead of throwing, so that a caller can
     * add the problems of its own checks and report them all together.
     *
     * @return the site as far as it could be read; values that were refused are NaN or null
     */
    public static SiteFile read(YamlNode root, SiteUse use, List<String> problems) {
        return new SiteReader(use, problems).site(root);
    }

    private SiteFile site(YamlNode root) {
        MappingReader site = new MappingReader(root, "the site", problems);
        String siteId = site.requiredString("siteId");
        String description = site.optionalString("description", "");
        var controller = site.node("controller");
        List<SiteFile.Area> areas = site.mappings("areas", true, "area").stream().map(this::area).toList();
        List<SiteFile.Tie> ties = site.mappings("ties", false, "tie").stream().map(this::tie).toList();
        List<SiteFile.Unit> units = site.mappings("units", false, "unit").stream().map(this::unit).toList();
        List<SiteFile.Load> loads = site.mappings("loads", false, "load").stream().map(this::load).toList();
        site.finish();
        return new SiteFile(siteId, description, areas, ties, units, loads, controller, site.locations());
    }

    private SiteFile.Area area(MappingReader r) {
        String id = r.requiredString("id");
        double f0 = r.requiredDouble("nominalFrequencyHz");
        double ratingMva = physics(r, "ratingMva");
        double inertiaS = physics(r, "inertiaS");
        double dampingMwPerHz = physics(r, "dampingMwPerHz");
        double bias = r.optionalDouble("biasMwPer01Hz", Double.NaN);
        double k = r.optionalDouble("kMwPerHz", Double.NaN);
        String convention = r.optionalChoice("aceConvention", "european", "european", "northAmerican");
        AceConvention ace = r.failed("aceConvention") ? null
                : convention.equals("northAmerican") ? AceConvention.NORTH_AMERICAN : AceConvention.EUROPEAN;
        r.finish();
        return new SiteFile.Area(id, f0, ratingMva, inertiaS, dampingMwPerHz, bias, k, ace, r.locations());
    }

    private SiteFile.Tie tie(MappingReader r) {
        String id = r.requiredString("id");
        String from = r.requiredString("fromArea");
        String to = r.requiredString("toArea");
        double scheduledFlowMw = r.optionalDouble("scheduledFlowMw", 0.0);
        boolean direct = r.has("synchronizingMwPerRad");
        boolean viaReactance = r.has("reactancePu");
        double sync = r.optionalDouble("synchronizingMwPerRad", Double.NaN);
        double x = r.optionalDouble("reactancePu", Double.NaN);
        double base = r.optionalDouble("baseMva", Double.NaN);
        double angle = r.optionalDouble("initialAngleDiffDeg", viaReactance ? 0.0 : Double.NaN);
        if (direct && viaReactance || !direct && !viaReactance && use == SiteUse.PHYSICS) {
            r.fail("needs exactly one of synchronizingMwPerRad or reactancePu (with baseMva and initialAngleDiffDeg)");
        } else if (viaReactance) {
            if (!r.has("baseMva")) {
                r.missing("baseMva");
            } else if (!(x > 0) || !(base > 0) || !(Math.abs(angle) < 90)) {
                r.fail("reactancePu", "must be > 0 with baseMva > 0 and |initialAngleDiffDeg| < 90, got "
                        + x + ", " + base + ", " + angle);
            }
        }
        r.finish();
        return new SiteFile.Tie(id, from, to, scheduledFlowMw, sync, x, base, angle, r.locations());
    }

    private SiteFile.Unit unit(MappingReader r) {
        String id = r.requiredString("id");
        String area = r.requiredString("area");
        double ratingMw = physics(r, "ratingMw");
        double droopPct = physics(r, "droopPct");
        double governorS = physics(r, "governorTimeConstantS");
        double deadBandHz = r.optionalDouble("deadBandHz", 0.0);
        double raise = r.optionalDouble("raiseRateMwPerMin", Double.POSITIVE_INFINITY);
        double lower = r.optionalDouble("lowerRateMwPerMin", Double.POSITIVE_INFINITY);
        boolean online = r.optionalBoolean("online", true);
        double tripS = r.optionalDouble("tripTimeConstantS", 0.5);
        boolean acceptsSetpoints = r.optionalBoolean("acceptsSetpoints", true);
        SiteFile.Cost cost = new SiteFile.Cost(r.optionalDouble("costA", 0), r.optionalDouble("costB", 0),
                r.optionalDouble("costC", 0));
        SiteFile.Limits limits = new SiteFile.Limits(r.optionalDouble("minOutputMw", Double.NaN),
                r.optionalDouble("maxOutputMw", Double.NaN), r.optionalDouble("initialOutputMw", Double.NaN),
                r.optionalDouble("regulatingMinMw", Double.NaN), r.optionalDouble("regulatingMaxMw", Double.NaN),
                r.optionalDouble("rampMwPerMin", Double.NaN), r.optionalDouble("pulseRateMwPerMin", Double.NaN));
        SiteFile.Turbine turbine = turbine(r);
        r.finish();
        return new SiteFile.Unit(id, area, ratingMw, droopPct, governorS, deadBandHz, raise, lower, online, tripS,
                acceptsSetpoints, cost, limits, turbine, r.locations());
    }

    private SiteFile.Turbine turbine(MappingReader r) {
        String name = use == SiteUse.PHYSICS ? r.requiredString("turbine") : r.optionalString("turbine", null);
        String word = name == null ? null : r.optionalChoice("turbine", null, "nonReheat", "reheat", "hydro");
        double nan = Double.NaN;
        if (word == null) {
            // not written or refused: its figures are read as they are, so a typo in them is still named
            return new SiteFile.Turbine(null, r.optionalDouble(TURBINE_KEYS[0], nan), r.optionalDouble(TURBINE_KEYS[1], nan),
                    r.optionalDouble(TURBINE_KEYS[2], nan), r.optionalDouble(TURBINE_KEYS[3], nan),
                    r.optionalDouble(TURBINE_KEYS[4], nan), r.optionalDouble(TURBINE_KEYS[5], nan),
                    r.optionalDouble(TURBINE_KEYS[6], 0.0));
        }
        return switch (word) {
            case "nonReheat" -> new SiteFile.Turbine(TurbineKind.NON_REHEAT, physics(r, "turbineTimeConstantS"),
                    nan, nan, nan, nan, nan, nan);
            case "reheat" -> new SiteFile.Turbine(TurbineKind.REHEAT, nan, physics(r, "steamChestTimeConstantS"),
                    physics(r, "reheatTimeConstantS"), physics(r, "hpFraction"), nan, nan, nan);
            default -> new SiteFile.Turbine(TurbineKind.HYDRO, nan, nan, nan, nan, physics(r, "waterStartingTimeS"),
                    r.optionalDouble("transientDroopPct", nan), r.optionalDouble("resetTimeS", 0.0));
        };
    }

    private SiteFile.Load load(MappingReader r) {
        SiteFile.Load l = new SiteFile.Load(r.requiredString("id"), r.requiredString("area"), physics(r, "baseMw"),
                r.optionalDoubles("dailyShapePu"), r.optionalDouble("noiseSigmaMw", 0.0),
                r.optionalDouble("noiseTauS", 60.0), r.optionalDouble("frequencySensitivityPctPerPct", 0.0),
                r.locations());
        r.finish();
        return l;
    }

    /** A figure the physics needs: required for {@link SiteUse#PHYSICS}, NaN when absent otherwise. */
    private double physics(MappingReader r, String key) {
        return use == SiteUse.PHYSICS ? r.requiredDouble(key) : r.optionalDouble(key, Double.NaN);
    }
}
