package org.loopstand.plant.profile;

import java.math.BigDecimal;
import java.math.MathContext;
import java.time.Instant;
import java.time.format.DateTimeParseException;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;

/**
 * How one field of the rig's message appears on a profiled wire: its name there, a scale (wire value =
 * rig value × {@code scale}, e.g. 1000 for MW → kW or Hz → mHz), an optional sign flip, and for
 * timestamps epoch ms or ISO-8601.
 *
 * @param rigField  the rig's field name (within an array element for an element mapping)
 * @param wireName  the name on the wire
 * @param scale     wire = rig × scale, finite and not 0
 * @param negate    true to flip the sign (after scaling)
 * @param time      how a timestamp is written: epoch ms (as the rig) or ISO-8601 text
 */
public record FieldMapping(String rigField, String wireName, double scale, boolean negate, TimeForm time) {
    /** Timestamp forms a profile can use. */
    public enum TimeForm {
        EPOCH_MS, ISO_8601
    }

    /** @return the rig value as the wire carries it */
    JsonNode toWire(JsonNode rig) {
        if (time == TimeForm.ISO_8601 && rig.canConvertToLong()) {
            return JsonNodeFactory.instance.textNode(Instant.ofEpochMilli(rig.asLong()).toString());
        }
        if (!rig.isNumber() || (scale == 1 && !negate)) {
            return rig;
        }
        return number(decimal(rig).multiply(BigDecimal.valueOf(negate ? -scale : scale), MathContext.DECIMAL64).doubleValue());
    }

    /**
     * @return the wire value in the rig's form
     * @throws IllegalArgumentException naming the field and the expected form when it cannot be read
     */
    JsonNode toRig(JsonNode wire) {
        if (time == TimeForm.ISO_8601) {
            if (!wire.isTextual()) {
                throw new IllegalArgumentException("field '" + wireName + "' must be an ISO-8601 time such as"
                        + " 2026-01-01T00:00:00.250Z, got " + wire);
            }
            try {
                return JsonNodeFactory.instance.numberNode(Instant.parse(wire.asText()).toEpochMilli());
            } catch (DateTimeParseException e) {
                throw new IllegalArgumentException("field '" + wireName + "' is not an ISO-8601 time: '" + wire.asText()
                        + "' (expected e.g. 2026-01-01T00:00:00.250Z)");
            }
        }
        if (!wire.isNumber() || (scale == 1 && !negate)) {
            return wire; // the codec judges the type
        }
        return number(decimal(wire).divide(BigDecimal.valueOf(negate ? -scale : scale), MathContext.DECIMAL64).doubleValue());
    }

    /** Decimal arithmetic on the shortest decimal form, so 40.0284 MW × 1000 ÷ 1000 is 40.0284 MW again. */
    private static BigDecimal decimal(JsonNode n) {
        return n.isIntegralNumber() ? new BigDecimal(n.bigIntegerValue()) : BigDecimal.valueOf(n.asDouble());
    }

    /** Whole numbers are written without a fraction, so integer fields stay integers after a scale. */
    private static JsonNode number(double v) {
        double r = Math.rint(v);
        if (Math.abs(v - r) < 1e-9 * Math.max(1, Math.abs(v)) && Math.abs(r) < 9e15) {
            return JsonNodeFactory.instance.numberNode((long) r);
        }
        return JsonNodeFactory.instance.numberNode(v);
    }
}
