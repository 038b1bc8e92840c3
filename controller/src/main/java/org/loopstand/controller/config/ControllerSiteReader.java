package org.loopstand.controller.config;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.function.Supplier;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.KeyLocations;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.site.AceConvention;
import org.loopstand.protocol.site.SiteFile;
import org.loopstand.protocol.site.SiteReader;
import org.loopstand.protocol.site.SiteUse;

/**
 * The controller's view of a site file, read with the shared {@link SiteReader} (for
 * {@link SiteUse#CONTROL}: physics figures may be left out): area ids, ACE convention and bias,
 * nominal frequency, ties, units' areas, cost curves and regulating limits, and the optional strict
 * {@code controller:} section ({@link ControllerSettingsReader}). Every problem is reported at once,
 * each as {@code file:line:column: what}.
 */
public final class ControllerSiteReader {
    private final List<String> problems = new ArrayList<>();
    /** every area id written in the file, also of areas refused for another reason */
    private final Set<String> declaredAreas = new HashSet<>();

    private ControllerSiteReader() {
    }

    /** @throws ConfigFileException naming every problem with file:line:column */
    public static ControllerSiteConfig read(Path file) {
        return new ControllerSiteReader().read(YamlNode.read(file));
    }

    /**
     * @param fileName used in messages only
     * @throws ConfigFileException naming every problem with file:line:column
     */
    public static ControllerSiteConfig read(String fileName, String text) {
        return new ControllerSiteReader().read(YamlNode.read(fileName, text));
    }

    private ControllerSiteConfig read(YamlNode root) {
        SiteFile site = SiteReader.read(root, SiteUse.CONTROL, problems);
        List<SiteArea> areas = new ArrayList<>();
        Set<String> areaIds = new HashSet<>();
        for (SiteFile.Area a : site.areas()) {
            SiteArea area = area(a);
            if (area != null && !areaIds.add(area.id())) {
                problems.add(a.where().problem("id", "'" + area.id() + "' appears twice"));
            } else if (area != null) {
                areas.add(area);
            }
        }
        List<SiteTie> ties = new ArrayList<>();
        for (SiteFile.Tie t : site.ties()) {
            checkArea(t.where(), "fromArea", t.fromArea());
            checkArea(t.where(), "toArea", t.toArea());
            if (t.id() != null && t.fromArea() != null && t.toArea() != null) {
                ties.add(new SiteTie(t.id(), t.fromArea(), t.toArea(), t.scheduledFlowMw()));
            }
        }
        List<SiteUnit> units = new ArrayList<>();
        for (SiteFile.Unit u : site.units()) {
            SiteUnit unit = unit(u);
            if (unit != null) {
                units.add(unit);
            }
        }
        double f0 = areas.isEmpty() ? 50.0 : areas.get(0).nominalFrequencyHz();
        YamlNode section = site.controller().orElse(new YamlNode.Mapping(site.where().of("controller"), java.util.Map.of()));
        ControllerSettings settings = ControllerSettingsReader.read(new MappingReader(section, "controller", problems), f0);
        ConfigFileException.throwIfAny(problems);
        return new ControllerSiteConfig(site.siteId(), areas, ties, units, settings);
    }

    private SiteArea area(SiteFile.Area a) {
        if (a.id() != null) {
            declaredAreas.add(a.id());
        }
        if (a.aceConvention() == null) {
            return null; // already refused by the reader
        }
        boolean european = a.aceConvention() == AceConvention.EUROPEAN;
        String biasKey = european ? "kMwPerHz" : "biasMwPer01Hz";
        double bias = european ? a.kMwPerHz() : a.biasMwPer01Hz();
        if (!a.where().has(biasKey)) {
            problems.add(a.where().missing(biasKey));
            return null;
        }
        if (a.id() == null || Double.isNaN(a.nominalFrequencyHz()) || Double.isNaN(bias)) {
            return null;
        }
        // the ACE settings check the sign of the bias and the frequency range
        AreaControlSettings.Builder b = AreaControlSettings.builder(a.id()).nominalFrequencyHz(a.nominalFrequencyHz());
        if (european) {
            b.europeanK(bias);
        } else {
            b.northAmericanBias(bias);
        }
        if (!attempt(a.where(), b::build)) {
            return null;
        }
        return new SiteArea(a.id(), a.aceConvention(), bias, a.nominalFrequencyHz());
    }

    private SiteUnit unit(SiteFile.Unit u) {
        checkArea(u.where(), "area", u.areaId());
        double rating = u.ratingMw();
        double min = u.limits().regulatingLowMw(0.0);
        double max = u.limits().regulatingHighMw(rating);
        double deadBandHz = u.deadBandHz();
        if (!(deadBandHz >= 0 && deadBandHz < 1)) {
            problems.add(u.where().problem("deadBandHz", "must be in [0, 1) Hz, got " + deadBandHz));
            deadBandHz = 0.0;
        }
        if (u.cost().c() > 0 && !(min <= max)) {
            problems.add(u.where().problem("needs regulating limits (regulatingMinMw/regulatingMaxMw or ratingMw) for"
                    + " its cost curve"));
        }
        if (u.id() == null || u.areaId() == null) {
            return null;
        }
        SiteFile.Turbine t = u.turbine();
        double lagS = GovernorResponse.rampLagS(t.kind() == null ? "" : t.kind().yamlName(),
                or(u.governorTimeConstantS(), 0.0), or(t.turbineTimeConstantS(), 0.0),
                or(t.steamChestTimeConstantS(), 0.0), or(t.reheatTimeConstantS(), 0.0), or(t.hpFraction(), 1.0),
                or(t.waterStartingTimeS(), 0.0), t.transientDroopPct(), u.droopPct(), or(t.resetTimeS(), 0.0));
        return new SiteUnit(u.id(), u.areaId(), u.cost().a(), u.cost().b(), u.cost().c(), min, max, rating,
                u.droopPct(), deadBandHz, lagS);
    }

    private void checkArea(KeyLocations where, String key, String area) {
        if (area != null && !declaredAreas.isEmpty() && !declaredAreas.contains(area)) {
            problems.add(where.problem(key, "names unknown area '" + area + "' (known: " + declaredAreas + ")"));
        }
    }

    private boolean attempt(KeyLocations where, Supplier<?> builder) {
        try {
            builder.get();
            return true;
        } catch (IllegalArgumentException e) {
            problems.add(where.problem("is refused: " + e.getMessage()));
            return false;
        }
    }

    /** A figure the controller may go without: NaN (not written) takes the neutral value. */
    private static double or(double v, double whenAbsent) {
        return Double.isNaN(v) ? whenAbsent : v;
    }
}
