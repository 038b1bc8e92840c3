package org.loopstand.controller.pulsetest.programme;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.nio.file.Path;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.pulsetest.governor.GovernorSpec;

/**
 * Reads one unit's declared figures and the site id from a site file (docs/physics.md). Only the keys
 * the pulse test needs are read; the plant's own loader validates the rest of the file.
 */
public final class SiteUnitReader {
    private static final ObjectMapper YAML = new ObjectMapper(new YAMLFactory());

    /**
     * @param siteId   the site's id (topic root)
     * @param unit     the unit's declaration; regulating limits default to the output limits when absent
     * @param governor the unit's governor as the site file gives it, or null when it gives no droop
     */
    public record SiteUnit(String siteId, UnitDeclaration unit, GovernorSpec governor) {
    }

    private SiteUnitReader() {
    }

    /** @throws IllegalArgumentException naming the file and what is missing */
    public static SiteUnit read(Path siteFile, String unitId) {
        JsonNode root;
        try {
            root = YAML.readTree(siteFile.toFile());
        } catch (IOException e) {
            throw new IllegalArgumentException(siteFile + ": cannot read the site file: " + e.getMessage(), e);
        }
        if (root == null || !root.path("siteId").isTextual()) {
            throw new IllegalArgumentException(siteFile + ": no siteId");
        }
        for (JsonNode u : root.path("units")) {
            if (unitId.equals(u.path("id").asText())) {
                double min = number(u, "regulatingMinMw", number(u, "minOutputMw", Double.NaN, siteFile), siteFile);
                double max = number(u, "regulatingMaxMw", number(u, "maxOutputMw", Double.NaN, siteFile), siteFile);
                double ramp = number(u, "rampMwPerMin", Double.NaN, siteFile);
                double pulse = number(u, "pulseRateMwPerMin", Double.NaN, siteFile);
                if (Double.isNaN(min) || Double.isNaN(max) || Double.isNaN(ramp) || Double.isNaN(pulse)) {
                    throw new IllegalArgumentException(siteFile + ": unit " + unitId + " lacks one of regulatingMinMw/"
                            + "minOutputMw, regulatingMaxMw/maxOutputMw, rampMwPerMin, pulseRateMwPerMin");
                }
                return new SiteUnit(root.get("siteId").asText(),
                        new UnitDeclaration(unitId, min, max, ramp, pulse, "site file " + siteFile),
                        governor(root, u, siteFile));
            }
        }
        throw new IllegalArgumentException(siteFile + ": no unit '" + unitId + "' in units");
    }

    /**
     * The governor path the plant physics uses (docs/physics.md): reheat = high-pressure share through
     * governor + steam chest, the rest also through the reheater; non-reheat = governor + turbine; hydro
     * = governor + the transient-droop lag (Rt/R × Tr), which holds the answer back at first.
     */
    private static GovernorSpec governor(JsonNode root, JsonNode u, Path file) {
        double droopPct = number(u, "droopPct", Double.NaN, file);
        double ratingMw = number(u, "ratingMw", Double.NaN, file);
        String area = u.path("area").asText("");
        double nominalHz = Double.NaN;
        for (JsonNode a : root.path("areas")) {
            if (area.equals(a.path("id").asText())) {
                nominalHz = number(a, "nominalFrequencyHz", 50, file);
            }
        }
        if (!(droopPct > 0) || !(ratingMw > 0) || Double.isNaN(nominalHz)) {
            return null;
        }
        double gainMwPerHz = GovernorResponse.mwPerHz(ratingMw, droopPct, nominalHz);
        double governorS = number(u, "governorTimeConstantS", 0, file);
        String turbine = u.path("turbine").asText("");
        double fastShare = 1;
        double fastLagS = governorS;
        double slowLagS = 0;
        switch (turbine) {
            case "reheat" -> {
                fastShare = number(u, "hpFraction", 0.3, file);
                fastLagS += number(u, "steamChestTimeConstantS", 0, file);
                slowLagS = number(u, "reheatTimeConstantS", 0, file);
            }
            case "nonReheat" -> fastLagS += number(u, "turbineTimeConstantS", 0, file);
            case "hydro" -> fastLagS += number(u, "transientDroopPct", 0, file) / droopPct
                    * number(u, "resetTimeS", 0, file);
            default -> {
                // unknown turbine: governor lag only
            }
        }
        try {
            return new GovernorSpec(area, nominalHz, gainMwPerHz, number(u, "deadBandHz", 0, file), fastShare,
                    fastLagS, slowLagS);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException(file + ": unit " + u.path("id").asText() + ": " + e.getMessage(), e);
        }
    }

    private static double number(JsonNode u, String key, double fallback, Path file) {
        JsonNode n = u.get(key);
        if (n == null) {
            return fallback;
        }
        if (!n.isNumber()) {
            throw new IllegalArgumentException(file + ": unit " + u.path("id").asText() + "." + key + " is not a number");
        }
        return n.asDouble();
    }
}
