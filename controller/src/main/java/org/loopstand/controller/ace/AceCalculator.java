package org.loopstand.controller.ace;

/**
 * Computes the area control error of one area from its {@link AreaControlSettings}.
 *
 * <p>Internally both conventions reduce to one positive bias {@code β} in MW/Hz:
 * North American {@code β = −10·B} (B in MW/0.1 Hz, negative), European {@code β = K}. Then
 * <pre>
 *   ACE = ΔNI + β·(Fa − Fs) + ACE_tec + ACE_pay
 *   ACE_tec = −β·Δf_tec,  Δf_tec = clamp(−TE·f0 / T_tec, ±Δf_tec,max)     (time-error correction)
 *   ACE_pay = E_ii / T_pay,  clamped to ±P_pay,max                          (inadvertent payback)
 * </pre>
 * The time-error term is the same as moving the scheduled frequency to {@code Fs + Δf_tec}: a
 * positive time error (clock ahead) runs frequency slightly low until it is worked off. The
 * payback term makes the area, at ACE = 0, export {@code E_ii/T_pay} less than scheduled when it has
 * exported too much before. Stateless and thread-safe.
 */
public final class AceCalculator {
    private final AreaControlSettings settings;

    public AceCalculator(AreaControlSettings settings) {
        if (settings == null) {
            throw new IllegalArgumentException("settings must not be null");
        }
        this.settings = settings;
    }

    public AreaControlSettings settings() {
        return settings;
    }

    /** @return the ACE for these inputs, MW, positive = over-generation */
    public AceResult compute(AceInputs in) {
        double betaMwPerHz = settings.biasMwPerHz();
        AceMode mode = settings.mode();
        double interchange = mode == AceMode.FLAT_FREQUENCY ? 0.0
                : in.netInterchangeActualMw() - in.netInterchangeScheduledMw();
        double frequency = mode == AceMode.FLAT_TIE_LINE ? 0.0
                : betaMwPerHz * (in.frequencyActualHz() - in.frequencyScheduledHz());
        double tec = 0.0;
        if (settings.timeErrorCorrectionEnabled() && mode != AceMode.FLAT_TIE_LINE) {
            double offsetHz = -in.timeErrorS() * settings.nominalFrequencyHz() / settings.timeErrorRecoveryS();
            offsetHz = clamp(offsetHz, settings.timeErrorMaxOffsetHz());
            tec = -betaMwPerHz * offsetHz;
        }
        double payback = 0.0;
        if (settings.inadvertentPaybackEnabled() && mode != AceMode.FLAT_FREQUENCY) {
            payback = clamp(in.inadvertentAccumMwh() / settings.inadvertentPaybackH(),
                    settings.inadvertentPaybackMaxMw());
        }
        return new AceResult(interchange + frequency + tec + payback, interchange, frequency, tec, payback);
    }

    private static double clamp(double v, double limit) {
        return Math.max(-limit, Math.min(limit, v));
    }
}
