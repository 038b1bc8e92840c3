package org.loopstand.controller.pulsetest.programme;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.nio.file.Path;

/**
 * Reads one unit's declared figures and the site id from a site file (docs/physics.md). Only the keys
 * the pulse test needs are read; the plant's own loader validates the rest of the file.
 */
public final class SiteUnitReader {
    private static final ObjectMapper YAML = new ObjectMapper(new YAMLFactory());

    /**
     * @param siteId the site's id (topic root)
     * @param unit   the unit's declaration; regulating limits default to the output limits when absent
     */
    public record SiteUnit(String siteId, UnitDeclaration unit) {
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
                        new UnitDeclaration(unitId, min, max, ramp, pulse, "site file " + siteFile));
            }
        }
        throw new IllegalArgumentException(siteFile + ": no unit '" + unitId + "' in units");
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
