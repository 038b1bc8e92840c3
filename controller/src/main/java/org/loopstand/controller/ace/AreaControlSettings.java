package org.loopstand.controller.ace;

import org.loopstand.protocol.site.AceConvention;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;

/**
 * Per-area ACE configuration. Build with {@link #builder(String)}; {@code build()} checks all
 * fields at once and names every problem.
 *
 * <p>Sign conventions: North American bias {@code B} is negative (MW/0.1 Hz); European {@code K} is
 * positive (MW/Hz). They describe the same quantity: {@code K = −10·B}.
 *
 * @param areaId                     area id
 * @param convention                 which bias convention the operator states
 * @param mode                       tie-line bias, flat frequency or flat tie line
 * @param biasMwPerHz                the bias as a positive MW/Hz figure (= −10B = K)
 * @param nominalFrequencyHz         f0, 50 or 60 Hz (any value in [40, 70])
 * @param timeErrorCorrectionEnabled add the time-error term
 * @param timeErrorRecoveryS         T_tec: time over which a time error is worked off, s (&gt; 0)
 * @param timeErrorMaxOffsetHz       bound on the frequency offset of the correction, Hz (&gt; 0)
 * @param inadvertentPaybackEnabled  add the inadvertent payback term
 * @param inadvertentPaybackH        T_pay: hours over which accumulated inadvertent is paid back (&gt; 0)
 * @param inadvertentPaybackMaxMw    bound on the payback term, MW (&gt; 0)
 */
public record AreaControlSettings(String areaId, AceConvention convention, AceMode mode, double biasMwPerHz,
                                  double nominalFrequencyHz,
                                  boolean timeErrorCorrectionEnabled, double timeErrorRecoveryS,
                                  double timeErrorMaxOffsetHz,
                                  boolean inadvertentPaybackEnabled, double inadvertentPaybackH,
                                  double inadvertentPaybackMaxMw) {

    private static final Pattern ID = Pattern.compile("[A-Za-z0-9][A-Za-z0-9_-]{0,63}");

    /** @return B in MW/0.1 Hz (negative), whichever convention the area was configured with */
    public double biasMwPer0p1Hz() {
        return -biasMwPerHz / 10.0;
    }

    public static Builder builder(String areaId) {
        return new Builder(areaId);
    }

    /** Collects settings; nothing is checked until {@link #build()}. */
    public static final class Builder {
        private final String areaId;
        private AceConvention convention;
        private Double biasBMwPer0p1Hz;
        private Double biasKMwPerHz;
        private AceMode mode = AceMode.TIE_LINE_BIAS;
        private double nominalFrequencyHz = 50.0;
        private boolean tecEnabled;
        private double tecRecoveryS = 3600.0;
        private double tecMaxOffsetHz = 0.02;
        private boolean paybackEnabled;
        private double paybackH = 4.0;
        private double paybackMaxMw = 50.0;

        private Builder(String areaId) {
            this.areaId = areaId;
        }

        /** North-American bias B, MW/0.1 Hz, must be negative. Selects {@link AceConvention#NORTH_AMERICAN}. */
        public Builder northAmericanBias(double bMwPer0p1Hz) {
            this.convention = AceConvention.NORTH_AMERICAN;
            this.biasBMwPer0p1Hz = bMwPer0p1Hz;
            this.biasKMwPerHz = null;
            return this;
        }

        /** European K-factor, MW/Hz, must be positive. Selects {@link AceConvention#EUROPEAN}. */
        public Builder europeanK(double kMwPerHz) {
            this.convention = AceConvention.EUROPEAN;
            this.biasKMwPerHz = kMwPerHz;
            this.biasBMwPer0p1Hz = null;
            return this;
        }

        public Builder mode(AceMode mode) {
            this.mode = mode;
            return this;
        }

        /** @param hz nominal frequency, Hz, in [40, 70]; default 50 */
        public Builder nominalFrequencyHz(double hz) {
            this.nominalFrequencyHz = hz;
            return this;
        }

        /** @param recoveryS s &gt; 0 (default 3600); @param maxOffsetHz Hz &gt; 0 (default 0.02) */
        public Builder timeErrorCorrection(double recoveryS, double maxOffsetHz) {
            this.tecEnabled = true;
            this.tecRecoveryS = recoveryS;
            this.tecMaxOffsetHz = maxOffsetHz;
            return this;
        }

        /** @param paybackH h &gt; 0 (default 4); @param maxMw MW &gt; 0 (default 50) */
        public Builder inadvertentPayback(double paybackH, double maxMw) {
            this.paybackEnabled = true;
            this.paybackH = paybackH;
            this.paybackMaxMw = maxMw;
            return this;
        }

        public AreaControlSettings build() {
            List<String> problems = new ArrayList<>();
            if (areaId == null || !ID.matcher(areaId).matches()) {
                problems.add("areaId must match " + ID.pattern() + ", was " + areaId);
            }
            double beta = Double.NaN;
            if (convention == null) {
                problems.add("a bias is required: northAmericanBias(B MW/0.1Hz, negative) or europeanK(K MW/Hz, positive)");
            } else if (convention == AceConvention.NORTH_AMERICAN) {
                double b = biasBMwPer0p1Hz;
                if (!Double.isFinite(b) || b >= 0) {
                    problems.add("North-American bias B must be negative (MW/0.1 Hz), was " + b
                            + (b > 0 ? "; did you mean B = " + (-b) + "?" : ""));
                } else {
                    beta = -10.0 * b;
                }
            } else {
                double k = biasKMwPerHz;
                if (!Double.isFinite(k) || k <= 0) {
                    problems.add("European K must be positive (MW/Hz), was " + k
                            + (k < 0 ? "; did you mean K = " + (-k) + "?" : ""));
                } else {
                    beta = k;
                }
            }
            if (mode == null) {
                problems.add("mode must not be null");
            }
            if (!(nominalFrequencyHz >= 40 && nominalFrequencyHz <= 70)) {
                problems.add("nominalFrequencyHz must be in [40, 70], was " + nominalFrequencyHz);
            }
            if (tecEnabled && !(tecRecoveryS > 0 && Double.isFinite(tecRecoveryS))) {
                problems.add("timeErrorRecoveryS must be > 0, was " + tecRecoveryS);
            }
            if (tecEnabled && !(tecMaxOffsetHz > 0 && tecMaxOffsetHz <= 0.5)) {
                problems.add("timeErrorMaxOffsetHz must be in (0, 0.5], was " + tecMaxOffsetHz);
            }
            if (paybackEnabled && !(paybackH > 0 && Double.isFinite(paybackH))) {
                problems.add("inadvertentPaybackH must be > 0, was " + paybackH);
            }
            if (paybackEnabled && !(paybackMaxMw > 0 && Double.isFinite(paybackMaxMw))) {
                problems.add("inadvertentPaybackMaxMw must be > 0, was " + paybackMaxMw);
            }
            if (!problems.isEmpty()) {
                throw new IllegalArgumentException("area " + areaId + " settings invalid: " + String.join("; ", problems));
            }
            return new AreaControlSettings(areaId, convention, mode, beta, nominalFrequencyHz,
                    tecEnabled, tecRecoveryS, tecMaxOffsetHz, paybackEnabled, paybackH, paybackMaxMw);
        }
    }
}
