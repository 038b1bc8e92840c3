package org.loopstand.controller.intake;

import org.loopstand.controller.config.InputValidationSettings;

import org.loopstand.controller.config.FallbackPolicy;

import java.util.EnumSet;

/**
 * One controller input (e.g. the frequency of area A) with its primary source, an optional
 * alternate source (second meter) and its fallback policy. Not thread-safe.
 *
 * <ul>
 *   <li>HOLD_LAST_GOOD: the last good value stays usable (held = true) while
 *       {@code now − its source time ≤ maxAgeMs + holdMs}; later: unusable, holdExpired.</li>
 *   <li>ALTERNATE_SOURCE: the alternate's value if it is usable (reason alternateSource).</li>
 *   <li>DECLARE_UNUSABLE: unusable at once.</li>
 * </ul>
 */
public final class ValidatedInput {
    private final InputValidationSettings settings;
    private final SourceValidator primary;
    private final SourceValidator alternate;

    /** @param settings also used for the alternate source, which has the same checks */
    public ValidatedInput(InputValidationSettings settings) {
        this.settings = settings;
        this.primary = new SourceValidator(settings);
        this.alternate = settings.policy() == FallbackPolicy.ALTERNATE_SOURCE ? new SourceValidator(settings) : null;
    }

    public java.util.Set<ValidationReason> acceptPrimary(MeasuredValue sample) {
        return primary.accept(sample);
    }

    /** @throws IllegalStateException when the policy is not ALTERNATE_SOURCE */
    public java.util.Set<ValidationReason> acceptAlternate(MeasuredValue sample) {
        if (alternate == null) {
            throw new IllegalStateException("input " + settings.inputName() + " has no alternate source (policy "
                    + settings.policy() + ")");
        }
        return alternate.accept(sample);
    }

    /** @return the value to use at controller time {@code nowMs}, fallback applied */
    public ValidatedValue evaluate(long nowMs) {
        ValidatedValue p = primary.evaluate(nowMs);
        if (p.usable()) {
            return p;
        }
        EnumSet<ValidationReason> r = EnumSet.noneOf(ValidationReason.class);
        r.addAll(p.reasons());
        switch (settings.policy()) {
            case HOLD_LAST_GOOD -> {
                MeasuredValue good = primary.lastGood();
                if (good != null) {
                    long ageMs = nowMs - good.sourceTimeMs();
                    if (ageMs <= settings.maxAgeMs() + settings.holdMs()) {
                        r.add(ValidationReason.HELD_LAST_GOOD);
                        return new ValidatedValue(good.value(), true, r, true, ageMs);
                    }
                    r.add(ValidationReason.HOLD_EXPIRED);
                }
                return new ValidatedValue(Double.NaN, false, r, false, p.ageMs());
            }
            case ALTERNATE_SOURCE -> {
                ValidatedValue a = alternate.evaluate(nowMs);
                if (a.usable()) {
                    r.add(ValidationReason.ALTERNATE_SOURCE);
                    return new ValidatedValue(a.value(), true, r, false, a.ageMs());
                }
                return new ValidatedValue(Double.NaN, false, r, false, p.ageMs());
            }
            default -> {
                return p;
            }
        }
    }

    /** Scales the clock skew limit of both sources to the replay rate ({@link SourceValidator#scaleClockSkewLimit}). */
    public void scaleClockSkewLimit(double rate) {
        primary.scaleClockSkewLimit(rate);
        if (alternate != null) {
            alternate.scaleClockSkewLimit(rate);
        }
    }

    public SourceValidator primary() { return primary; }
    /** @return the alternate source's validator, or null without one */
    public SourceValidator alternate() { return alternate; }
    public InputValidationSettings settings() { return settings; }
}
