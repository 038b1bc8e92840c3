package org.loopstand.plant.site;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;

import org.loopstand.plant.grid.AceConvention;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.loopstand.plant.grid.GridProblem;
import org.loopstand.plant.grid.GridValidationException;
import org.loopstand.plant.grid.UnitSpec;
import org.loopstand.plant.physics.SmallSignalStability;

/**
 * Reads a site file (YAML, see docs/physics.md for the keys) into a {@link Grid}. Unknown keys, missing
 * or mistyped values and every check of {@link GridBuilder#build()} are reported together, each as
 * {@code file:line:column: what is wrong}, in one {@link ConfigFileException}.
 */
public final class SiteLoader {
    private final List<String> problems = new ArrayList<>();
    private final Map<String, MappingReader> readersBySubject = new HashMap<>();

    private SiteLoader() {
    }

    public static Grid load(Path file) throws IOException {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return load(file.toString(), r);
        }
    }

    /**
     * Loads a site for a run: {@link #load(Path)} and then the small-signal screen
     * ({@link SmallSignalStability}, docs/physics.md). An unstable site is refused in the
     * {@link ConfigFileException}, naming the growing mode; a lightly damped one is passed on with a warning.
     *
     * @param warnings receives each warning as {@code file: warning: what}
     */
    public static Grid loadForRun(Path file, Consumer<String> warnings) throws IOException {
        Grid grid = load(file);
        SmallSignalStability.Report report = SmallSignalStability.assess(grid);
        if (report.refused()) {
            throw new ConfigFileException(List.of(file + ": site refused by the stability screen: " + report.describe()));
        }
        if (report.verdict() != SmallSignalStability.Verdict.STABLE) {
            warnings.accept(file + ": warning: " + report.describe());
        }
        return grid;
    }

    /** @param fileName used in messages only */
    public static Grid load(String fileName, Reader reader) throws IOException {
        return new SiteLoader().read(YamlNode.read(fileName, reader));
    }

    private Grid read(YamlNode root) {
        MappingReader site = new MappingReader(root, "the site", problems);
        readersBySubject.put("site", site);
        GridBuilder b = new GridBuilder(site.requiredString("siteId"));
        site.optionalString("description", "");
        site.allow("controller"); // the controller's own section, read by the controller
        for (YamlNode n : site.sequence("areas", true)) {
            readArea(b, n);
        }
        for (YamlNode n : site.sequence("ties", false)) {
            readTie(b, n);
        }
        for (YamlNode n : site.sequence("units", false)) {
            readUnit(b, n);
        }
        for (YamlNode n : site.sequence("loads", false)) {
            readLoad(b, n);
        }
        site.finish();
        Grid grid = null;
        try {
            grid = b.build();
        } catch (GridValidationException e) {
            for (GridProblem p : e.problems()) {
                MappingReader r = readersBySubject.getOrDefault(p.subject(), site);
                if (!r.failed(p.field())) {
                    problems.add(r.locationOf(p.field()) + ": " + p);
                }
            }
        }
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
        return grid;
    }

    private MappingReader reader(YamlNode n, String kind) {
        String id = n instanceof YamlNode.Mapping m && m.entries().get("id") != null
                && m.entries().get("id").value() instanceof YamlNode.Scalar s ? s.text() : "?";
        MappingReader r = new MappingReader(n, kind + " " + id, problems);
        readersBySubject.put(kind + " " + id, r);
        return r;
    }

    private void readArea(GridBuilder b, YamlNode n) {
        MappingReader r = reader(n, "area");
        var a = b.area(r.requiredString("id"))
                .nominalFrequencyHz(r.requiredDouble("nominalFrequencyHz"))
                .ratingMva(r.requiredDouble("ratingMva"))
                .inertiaS(r.requiredDouble("inertiaS"))
                .dampingMwPerHz(r.requiredDouble("dampingMwPerHz"))
                .biasMwPer01Hz(r.optionalDouble("biasMwPer01Hz", Double.NaN))
                .kMwPerHz(r.optionalDouble("kMwPerHz", Double.NaN));
        String convention = r.optionalString("aceConvention", "european");
        switch (convention) {
            case "european" -> a.aceConvention(AceConvention.EUROPEAN);
            case "northAmerican" -> a.aceConvention(AceConvention.NORTH_AMERICAN);
            default -> r.fail("aceConvention", "must be 'european' or 'northAmerican', got '" + convention + "'");
        }
        r.finish();
    }

    private void readTie(GridBuilder b, YamlNode n) {
        MappingReader r = reader(n, "tie");
        var t = b.tie(r.requiredString("id"), r.requiredString("fromArea"), r.requiredString("toArea"))
                .scheduledFlowMw(r.optionalDouble("scheduledFlowMw", 0.0));
        boolean direct = r.has("synchronizingMwPerRad");
        boolean viaReactance = r.has("reactancePu");
        if (direct == viaReactance) {
            problems.add(r.location() + ": " + r.what() + " needs exactly one of synchronizingMwPerRad or "
                    + "reactancePu (with baseMva and initialAngleDiffDeg)");
            r.optionalDouble("synchronizingMwPerRad", 0);
            r.optionalDouble("reactancePu", 0);
            r.optionalDouble("baseMva", 0);
            r.optionalDouble("initialAngleDiffDeg", 0);
        } else if (direct) {
            t.synchronizingMwPerRad(r.requiredDouble("synchronizingMwPerRad"));
        } else {
            double x = r.requiredDouble("reactancePu");
            double base = r.requiredDouble("baseMva");
            double angle = r.optionalDouble("initialAngleDiffDeg", 0.0);
            if (!(x > 0) || !(base > 0) || !(Math.abs(angle) < 90)) {
                problems.add(r.locationOf("reactancePu") + ": " + r.what() + " needs reactancePu > 0, baseMva > 0 and "
                        + "|initialAngleDiffDeg| < 90, got " + x + ", " + base + ", " + angle);
            }
            t.fromReactance(x, base, angle);
        }
        r.finish();
    }

    private void readUnit(GridBuilder b, YamlNode n) {
        MappingReader r = reader(n, "unit");
        UnitSpec u = b.unit(r.requiredString("id"), r.requiredString("area"))
                .ratingMw(r.requiredDouble("ratingMw"))
                .droopPct(r.requiredDouble("droopPct"))
                .governorTimeConstantS(r.requiredDouble("governorTimeConstantS"))
                .deadBandHz(r.optionalDouble("deadBandHz", 0.0))
                .raiseRateMwPerMin(r.optionalDouble("raiseRateMwPerMin", Double.POSITIVE_INFINITY))
                .lowerRateMwPerMin(r.optionalDouble("lowerRateMwPerMin", Double.POSITIVE_INFINITY))
                .online(r.optionalBoolean("online", true))
                .tripTimeConstantS(r.optionalDouble("tripTimeConstantS", 0.5))
                .acceptsSetpoints(r.optionalBoolean("acceptsSetpoints", true))
                .cost(r.optionalDouble("costA", 0), r.optionalDouble("costB", 0), r.optionalDouble("costC", 0));
        optional(r, "minOutputMw", u::minOutputMw);
        optional(r, "maxOutputMw", u::maxOutputMw);
        optional(r, "initialOutputMw", u::initialOutputMw);
        optional(r, "regulatingMinMw", u::regulatingMinMw);
        optional(r, "regulatingMaxMw", u::regulatingMaxMw);
        optional(r, "rampMwPerMin", u::rampMwPerMin);
        optional(r, "pulseRateMwPerMin", u::pulseRateMwPerMin);
        String turbine = r.requiredString("turbine");
        if (turbine != null) {
            switch (turbine) {
                case "nonReheat" -> u.nonReheat(r.requiredDouble("turbineTimeConstantS"));
                case "reheat" -> u.reheat(r.requiredDouble("steamChestTimeConstantS"),
                        r.requiredDouble("reheatTimeConstantS"), r.requiredDouble("hpFraction"));
                case "hydro" -> u.hydro(r.requiredDouble("waterStartingTimeS"),
                        r.optionalDouble("transientDroopPct", Double.NaN), r.optionalDouble("resetTimeS", 0.0));
                default -> {
                    r.fail("turbine", "must be nonReheat, reheat or hydro, got '" + turbine + "'");
                    r.allow("turbineTimeConstantS", "steamChestTimeConstantS", "reheatTimeConstantS", "hpFraction",
                            "waterStartingTimeS", "transientDroopPct", "resetTimeS");
                }
            }
        }
        r.finish();
    }

    private void readLoad(GridBuilder b, YamlNode n) {
        MappingReader r = reader(n, "load");
        b.load(r.requiredString("id"), r.requiredString("area"))
                .baseMw(r.requiredDouble("baseMw"))
                .dailyShapePu(r.optionalDoubles("dailyShapePu"))
                .noise(r.optionalDouble("noiseSigmaMw", 0.0), r.optionalDouble("noiseTauS", 60.0))
                .frequencySensitivityPctPerPct(r.optionalDouble("frequencySensitivityPctPerPct", 0.0));
        r.finish();
    }

    private static void optional(MappingReader r, String key, java.util.function.DoubleConsumer setter) {
        if (r.has(key)) {
            setter.accept(r.optionalDouble(key, Double.NaN));
        }
    }

}
