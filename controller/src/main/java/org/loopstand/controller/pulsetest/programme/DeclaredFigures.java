package org.loopstand.controller.pulsetest.programme;

import java.util.List;
import java.util.Locale;
import org.loopstand.protocol.message.UnitTelemetry;

/** Chooses the declared figures a unit is judged against: the site file's, or its own telemetry's. */
public final class DeclaredFigures {
    private DeclaredFigures() {
    }

    /**
     * @param site  the site file's declaration, or null to take the unit's telemetry
     * @param notes receives every difference between the two, and a note when the telemetry's are unusable
     * @throws IllegalArgumentException when there is no site declaration and the telemetry's is unusable
     */
    public static UnitDeclaration resolve(String unitId, UnitDeclaration site, UnitTelemetry t, List<String> notes) {
        UnitDeclaration fromTelemetry;
        try {
            fromTelemetry = new UnitDeclaration(unitId, t.regulatingMinMw(), t.regulatingMaxMw(), t.rampMwPerMin(),
                    t.pulseRateMwPerMin(), "unit telemetry");
        } catch (IllegalArgumentException e) {
            if (site == null) {
                throw new IllegalArgumentException("the unit's telemetry does not declare usable figures: "
                        + e.getMessage(), e);
            }
            notes.add("the unit's telemetry declares unusable figures (" + e.getMessage() + "); the site file's are used");
            return site;
        }
        if (site == null) {
            return fromTelemetry;
        }
        double[][] pairs = {{site.rampMwPerMin(), fromTelemetry.rampMwPerMin()},
                {site.pulseRateMwPerMin(), fromTelemetry.pulseRateMwPerMin()},
                {site.regulatingMinMw(), fromTelemetry.regulatingMinMw()},
                {site.regulatingMaxMw(), fromTelemetry.regulatingMaxMw()}};
        String[] names = {"rampMwPerMin", "pulseRateMwPerMin", "regulatingMinMw", "regulatingMaxMw"};
        for (int i = 0; i < pairs.length; i++) {
            if (Math.abs(pairs[i][0] - pairs[i][1]) > 1e-6 * Math.max(1, Math.abs(pairs[i][0]))) {
                notes.add(String.format(Locale.ROOT, "%s: site file declares %.3f, unit telemetry %.3f; the site "
                        + "file's figure is judged against", names[i], pairs[i][0], pairs[i][1]));
            }
        }
        return site;
    }
}
