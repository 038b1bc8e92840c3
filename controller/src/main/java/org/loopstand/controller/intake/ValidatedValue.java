package org.loopstand.controller.intake;

import java.util.Collections;
import java.util.EnumSet;
import java.util.Set;

/**
 * The value the controller may use for one input this cycle.
 *
 * @param value   value in the input's unit; NaN when there is none
 * @param usable  true when the value may drive control
 * @param reasons everything noticed (also informational ones on a usable value, e.g. seqGap,
 *                heldLastGood, alternateSource)
 * @param held    true when this is an older good value held under the hold-last-good policy
 * @param ageMs   controller time minus the value's source time, ms (Long.MAX_VALUE with no data)
 */
public record ValidatedValue(double value, boolean usable, Set<ValidationReason> reasons, boolean held, long ageMs) {
    public ValidatedValue {
        reasons = reasons.isEmpty() ? Collections.emptySet()
                : Collections.unmodifiableSet(EnumSet.copyOf(reasons));
        if (usable && !Double.isFinite(value)) {
            throw new IllegalArgumentException("a usable value must be finite, was " + value);
        }
    }

    public static ValidatedValue good(double value, long ageMs) {
        return new ValidatedValue(value, true, Set.of(), false, ageMs);
    }

    public static ValidatedValue unusable(Set<ValidationReason> reasons, long ageMs) {
        return new ValidatedValue(Double.NaN, false, reasons, false, ageMs);
    }
}
