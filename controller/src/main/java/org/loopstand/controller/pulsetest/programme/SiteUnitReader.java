package org.loopstand.controller.pulsetest.programme;

import java.nio.file.Path;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.pulsetest.governor.GovernorSpec;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.KeyLocations;
import org.loopstand.protocol.site.SiteFile;
import org.loopstand.protocol.site.SiteReader;
import org.loopstand.protocol.site.SiteUse;

/**
 * The pulse test's view of a site file, read with the shared {@link SiteReader} (for
 * {@link SiteUse#PHYSICS}: the test removes the governor's answer, so it needs the physics figures):
 * one unit's declared figures, its governor and the site id.
 */
public final class SiteUnitReader {
    /**
     * @param siteId   the site's id (topic root)
     * @param unit     the unit's declaration; regulating limits default to the output limits when absent
     * @param governor the unit's governor as the site file gives it, or null when it gives no droop
     */
    public record SiteUnit(String siteId, UnitDeclaration unit, GovernorSpec governor) {
    }

    private SiteUnitReader() {
    }

    /**
     * @throws ConfigFileException      naming every problem of the site file with file:line:column
     * @throws IllegalArgumentException when the site has no such unit
     */
    public static SiteUnit read(Path siteFile, String unitId) {
        SiteFile site = SiteReader.read(siteFile, SiteUse.PHYSICS);
        SiteFile.Unit u = site.unit(unitId).orElseThrow(() -> new IllegalArgumentException(siteFile
                + ": no unit '" + unitId + "' in units (units: " + site.units().stream().map(SiteFile.Unit::id).toList()
                + ")"));
        SiteFile.Limits l = u.limits();
        double min = l.regulatingLowMw(Double.NaN);
        double max = l.regulatingHighMw(Double.NaN);
        KeyLocations where = u.where();
        if (Double.isNaN(min) || Double.isNaN(max) || Double.isNaN(l.rampMwPerMin()) || Double.isNaN(l.pulseRateMwPerMin())) {
            throw new ConfigFileException(java.util.List.of(where.problem("needs regulatingMinMw (or minOutputMw), "
                    + "regulatingMaxMw (or maxOutputMw), rampMwPerMin and pulseRateMwPerMin for a pulse test")));
        }
        return new SiteUnit(site.siteId(),
                new UnitDeclaration(unitId, min, max, l.rampMwPerMin(), l.pulseRateMwPerMin(), "site file " + siteFile),
                governor(site, u));
    }

    /**
     * The governor path the plant physics uses (docs/physics.md): reheat = high-pressure share through
     * governor + steam chest, the rest also through the reheater; non-reheat = governor + turbine; hydro
     * = governor + the transient-droop lag (Rt/R × Tr), which holds the answer back at first.
     */
    private static GovernorSpec governor(SiteFile site, SiteFile.Unit u) {
        double droopPct = u.droopPct();
        double nominalHz = site.area(u.areaId()).map(SiteFile.Area::nominalFrequencyHz).orElse(Double.NaN);
        if (!(droopPct > 0) || !(u.ratingMw() > 0) || Double.isNaN(nominalHz)) {
            return null;
        }
        double gainMwPerHz = GovernorResponse.mwPerHz(u.ratingMw(), droopPct, nominalHz);
        SiteFile.Turbine t = u.turbine();
        double fastShare = 1;
        double fastLagS = u.governorTimeConstantS();
        double slowLagS = 0;
        switch (t.kind()) {
            case REHEAT -> {
                fastShare = t.hpFraction();
                fastLagS += t.steamChestTimeConstantS();
                slowLagS = t.reheatTimeConstantS();
            }
            case NON_REHEAT -> fastLagS += t.turbineTimeConstantS();
            case HYDRO -> fastLagS += (Double.isNaN(t.transientDroopPct()) ? 0 : t.transientDroopPct()) / droopPct
                    * t.resetTimeS();
        }
        try {
            return new GovernorSpec(u.areaId(), nominalHz, gainMwPerHz, u.deadBandHz(), fastShare, fastLagS, slowLagS);
        } catch (IllegalArgumentException e) {
            throw new ConfigFileException(java.util.List.of(u.where().problem("has a governor the pulse test cannot use: "
                    + e.getMessage())));
        }
    }
}
