package org.loopstand.controller.safety;

import java.util.Optional;
import org.loopstand.controller.intake.ValidatedValue;

/**
 * A value that passed validation. The only way to get one is {@link #from(ValidatedValue)}, which
 * refuses unusable values (the constructor is private); code that computes ACE and pulses takes
 * {@code UsableValue}, so no pulse can be computed from a value that failed validation.
 */
public final class UsableValue {
    private final double value;
    private final boolean held;
    private final long ageMs;

    private UsableValue(double value, boolean held, long ageMs) {
        this.value = value;
        this.held = held;
        this.ageMs = ageMs;
    }

    /** @return the value if it is usable, empty otherwise (also for null) */
    public static Optional<UsableValue> from(ValidatedValue v) {
        if (v == null || !v.usable() || !Double.isFinite(v.value())) {
            return Optional.empty();
        }
        return Optional.of(new UsableValue(v.value(), v.held(), v.ageMs()));
    }

    /** @return the value in the input's unit, finite */
    public double value() { return value; }
    /** @return true when this is a held last-good value */
    public boolean held() { return held; }
    /** @return age at validation, ms */
    public long ageMs() { return ageMs; }

    @Override
    public String toString() {
        return "UsableValue[" + value + (held ? ", held" : "") + ", ageMs=" + ageMs + "]";
    }
}
