package org.loopstand.plant.site;

import java.io.IOException;
import java.io.Reader;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import java.util.function.DoubleConsumer;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.loopstand.plant.grid.GridProblem;
import org.loopstand.plant.grid.GridValidationException;
import org.loopstand.plant.grid.UnitSpec;
import org.loopstand.plant.physics.SmallSignalStability;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.KeyLocations;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.site.SiteFile;
import org.loopstand.protocol.site.SiteReader;
import org.loopstand.protocol.site.SiteUse;

/**
 * The plant's view of a site file: reads it with the shared {@link SiteReader} (for {@link SiteUse#PHYSICS})
 * and builds its {@link Grid}. The reader's problems and every check of {@link GridBuilder#build()} are
 * reported together, each as {@code file:line:column: what is wrong}, in one {@link ConfigFileException}.
 */
public final class SiteLoader {
    private final List<String> problems = new ArrayList<>();
    private final Map<String, KeyLocations> placesBySubject = new HashMap<>();

    private SiteLoader() {
    }

    public static Grid load(Path file) throws IOException {
        return new SiteLoader().build(YamlNode.read(file));
    }

    /** @return ids of hydro units whose governor has no transient droop compensation (Rt = Rp) */
    static List<String> uncompensatedHydroUnits(Grid grid) {
        return grid.units().stream()
                .filter(u -> u.turbine() instanceof org.loopstand.plant.grid.Turbine.Hydro h && !(h.transientDroopPct() > u.droopPct()))
                .map(u -> u.id()).toList();
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
            List<String> problems = new ArrayList<>(List.of(file + ": site refused by the stability screen: " + report.describe()));
            List<String> plain = uncompensatedHydroUnits(grid);
            if (!plain.isEmpty()) {
                problems.add(file + ": hint: hydro unit(s) " + String.join(", ", plain) + " have no transient droop compensation"
                        + " (transientDroopPct not set or equal to droopPct); a plain hydro governor is often unstable:"
                        + " set transientDroopPct and resetTimeS (docs/physics.md, hydro turbine)");
            }
            throw new ConfigFileException(problems);
        }
        if (report.verdict() != SmallSignalStability.Verdict.STABLE) {
            warnings.accept(file + ": warning: " + report.describe());
        }
        return grid;
    }

    /** @param fileName used in messages only */
    public static Grid load(String fileName, Reader reader) throws IOException {
        return new SiteLoader().build(YamlNode.read(fileName, reader));
    }

    private Grid build(YamlNode root) {
        SiteFile site = SiteReader.read(root, SiteUse.PHYSICS, problems);
        placesBySubject.put("site", site.where());
        GridBuilder b = new GridBuilder(site.siteId());
        site.areas().forEach(a -> area(b, a));
        site.ties().forEach(t -> tie(b, t));
        site.units().forEach(u -> unit(b, u));
        site.loads().forEach(l -> load(b, l));
        Grid grid = null;
        try {
            grid = b.build();
        } catch (GridValidationException e) {
            for (GridProblem p : e.problems()) {
                KeyLocations at = placesBySubject.getOrDefault(p.subject(), site.where());
                if (!at.failed(p.field())) {
                    problems.add(at.of(p.field()) + ": " + p);
                }
            }
        }
        ConfigFileException.throwIfAny(problems);
        return grid;
    }

    private void area(GridBuilder b, SiteFile.Area a) {
        placesBySubject.put("area " + a.id(), a.where());
        var spec = b.area(a.id()).nominalFrequencyHz(a.nominalFrequencyHz()).ratingMva(a.ratingMva())
                .inertiaS(a.inertiaS()).dampingMwPerHz(a.dampingMwPerHz()).biasMwPer01Hz(a.biasMwPer01Hz())
                .kMwPerHz(a.kMwPerHz());
        if (a.aceConvention() != null) {
            spec.aceConvention(a.aceConvention());
        }
    }

    private void tie(GridBuilder b, SiteFile.Tie t) {
        placesBySubject.put("tie " + t.id(), t.where());
        var spec = b.tie(t.id(), t.fromArea(), t.toArea()).scheduledFlowMw(t.scheduledFlowMw());
        boolean viaReactance = !Double.isNaN(t.reactancePu());
        if (t.direct() && !viaReactance) {
            spec.synchronizingMwPerRad(t.synchronizingMwPerRad());
        } else if (viaReactance && !t.direct()) {
            spec.fromReactance(t.reactancePu(), t.baseMva(), t.initialAngleDiffDeg());
        }
    }

    private void unit(GridBuilder b, SiteFile.Unit u) {
        placesBySubject.put("unit " + u.id(), u.where());
        UnitSpec spec = b.unit(u.id(), u.areaId()).ratingMw(u.ratingMw()).droopPct(u.droopPct())
                .governorTimeConstantS(u.governorTimeConstantS()).deadBandHz(u.deadBandHz())
                .raiseRateMwPerMin(u.raiseRateMwPerMin()).lowerRateMwPerMin(u.lowerRateMwPerMin())
                .online(u.online()).tripTimeConstantS(u.tripTimeConstantS()).acceptsSetpoints(u.acceptsSetpoints())
                .cost(u.cost().a(), u.cost().b(), u.cost().c());
        SiteFile.Limits l = u.limits();
        ifWritten(l.minOutputMw(), spec::minOutputMw);
        ifWritten(l.maxOutputMw(), spec::maxOutputMw);
        ifWritten(l.initialOutputMw(), spec::initialOutputMw);
        ifWritten(l.regulatingMinMw(), spec::regulatingMinMw);
        ifWritten(l.regulatingMaxMw(), spec::regulatingMaxMw);
        ifWritten(l.rampMwPerMin(), spec::rampMwPerMin);
        ifWritten(l.pulseRateMwPerMin(), spec::pulseRateMwPerMin);
        SiteFile.Turbine t = u.turbine();
        if (t.kind() != null) {
            switch (t.kind()) {
                case NON_REHEAT -> spec.nonReheat(t.turbineTimeConstantS());
                case REHEAT -> spec.reheat(t.steamChestTimeConstantS(), t.reheatTimeConstantS(), t.hpFraction());
                case HYDRO -> spec.hydro(t.waterStartingTimeS(), t.transientDroopPct(), t.resetTimeS());
            }
        }
    }

    private void load(GridBuilder b, SiteFile.Load l) {
        placesBySubject.put("load " + l.id(), l.where());
        b.load(l.id(), l.areaId()).baseMw(l.baseMw()).dailyShapePu(l.dailyShapePu())
                .noise(l.noiseSigmaMw(), l.noiseTauS())
                .frequencySensitivityPctPerPct(l.frequencySensitivityPctPerPct());
    }

    /** An absent figure (NaN) leaves the builder's own default, derived from the unit's other figures. */
    private static void ifWritten(double v, DoubleConsumer setter) {
        if (!Double.isNaN(v)) {
            setter.accept(v);
        }
    }
}
