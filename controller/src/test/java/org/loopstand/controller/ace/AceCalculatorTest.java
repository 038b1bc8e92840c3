package org.loopstand.controller.ace;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class AceCalculatorTest {
    // Two-area example (Saadat, Power System Analysis, ch. 12, from memory):
    // 1000 MW base, 60 Hz, beta1 = 20.6 pu, beta2 = 16.9 pu, 187.5 MW load step in area 1.
    // Re-derived: df = -0.1875/(20.6+16.9) pu = -0.005 pu = -0.3 Hz;
    // dP_tie,1->2 = beta2*df = -0.0845 pu = -84.5 MW.
    // beta in MW/Hz = pu * 1000 MW / 60 Hz: beta1 = 343.33 MW/Hz (B1 = -34.333 MW/0.1Hz),
    // beta2 = 281.67 MW/Hz (B2 = -28.167 MW/0.1Hz).
    private static final double F0 = 60.0;
    private static final double DF_HZ = -0.3;
    private static final double TIE_1_TO_2_MW = -84.5;
    private static final double BETA1_MW_PER_HZ = 20.6 * 1000 / 60;
    private static final double BETA2_MW_PER_HZ = 16.9 * 1000 / 60;

    private static AceCalculator na(String area, double betaMwPerHz, AceMode mode) {
        return new AceCalculator(AreaControlSettings.builder(area).northAmericanBias(-betaMwPerHz / 10)
                .nominalFrequencyHz(F0).mode(mode).build());
    }

    private static AceCalculator eu(String area, double kMwPerHz, AceMode mode) {
        return new AceCalculator(AreaControlSettings.builder(area).europeanK(kMwPerHz)
                .nominalFrequencyHz(F0).mode(mode).build());
    }

    @Test
    void shouldGiveAreaOneAloneTheDisturbanceWithTieLineBias() {
        // With bias = beta the ACE of the disturbed area equals minus its load step, the other area 0
        // (tie-line bias property; Saadat, ch. 12, from memory).
        AceResult a1 = na("A1", BETA1_MW_PER_HZ, AceMode.TIE_LINE_BIAS)
                .compute(AceInputs.of(TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0));
        AceResult a2 = na("A2", BETA2_MW_PER_HZ, AceMode.TIE_LINE_BIAS)
                .compute(AceInputs.of(-TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0));
        assertThat(a1.aceMw()).isCloseTo(-187.5, within(1e-6));
        assertThat(a2.aceMw()).isCloseTo(0.0, within(1e-6));
        assertThat(a1.frequencyTermMw()).isCloseTo(-103.0, within(1e-6));
    }

    @Test
    void shouldMatchBetweenConventionsWhenBEqualsMinusKOverTen() {
        AceInputs in = AceInputs.of(TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0);
        double naAce = na("A1", BETA1_MW_PER_HZ, AceMode.TIE_LINE_BIAS).compute(in).aceMw();
        double euAce = eu("A1", BETA1_MW_PER_HZ, AceMode.TIE_LINE_BIAS).compute(in).aceMw();
        assertThat(euAce).isCloseTo(naAce, within(1e-9));
        assertThat(AreaControlSettings.builder("A1").europeanK(343.3).build().biasMwPer0p1Hz())
                .isCloseTo(-34.33, within(1e-9));
    }

    @Test
    void shouldAskForRaiseInBothConventionsWhenGenerationIsShort() {
        // under-generation: frequency low and importing more than scheduled -> ACE negative -> raise
        AceInputs in = AceInputs.of(-50, 0, 49.95, 50.0);
        AceCalculator n = new AceCalculator(AreaControlSettings.builder("X").northAmericanBias(-100).build());
        AceCalculator e = new AceCalculator(AreaControlSettings.builder("X").europeanK(1000).build());
        assertThat(n.compute(in).aceMw()).isNegative().isCloseTo(-100, within(1e-9));
        assertThat(e.compute(in).aceMw()).isNegative().isCloseTo(-100, within(1e-9));
    }

    @Test
    void shouldUseOnlyFrequencyInFlatFrequencyMode() {
        AceInputs in1 = AceInputs.of(TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0);
        AceInputs in2 = AceInputs.of(-TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0);
        assertThat(na("A1", BETA1_MW_PER_HZ, AceMode.FLAT_FREQUENCY).compute(in1).aceMw())
                .isCloseTo(-103.0, within(1e-6));
        assertThat(na("A2", BETA2_MW_PER_HZ, AceMode.FLAT_FREQUENCY).compute(in2).aceMw())
                .isCloseTo(-84.5, within(1e-6));
    }

    @Test
    void shouldUseOnlyInterchangeInFlatTieLineMode() {
        AceInputs in1 = AceInputs.of(TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0);
        AceInputs in2 = AceInputs.of(-TIE_1_TO_2_MW, 0, F0 + DF_HZ, F0);
        assertThat(eu("A1", BETA1_MW_PER_HZ, AceMode.FLAT_TIE_LINE).compute(in1).aceMw()).isCloseTo(-84.5, within(1e-9));
        assertThat(eu("A2", BETA2_MW_PER_HZ, AceMode.FLAT_TIE_LINE).compute(in2).aceMw()).isCloseTo(84.5, within(1e-9));
    }

    @Test
    void shouldRunFrequencyLowToWorkOffPositiveTimeError() {
        // 50 Hz, K = 1000 MW/Hz, time error +10 s over 3600 s recovery:
        // offset = -10*50/3600 = -0.1389 Hz, clamped to -0.02 Hz; term = -K*offset = +20 MW.
        AceCalculator c = new AceCalculator(AreaControlSettings.builder("X").europeanK(1000)
                .timeErrorCorrection(3600, 0.02).build());
        AceResult r = c.compute(new AceInputs(0, 0, 50.0, 50.0, 10.0, 0));
        assertThat(r.timeErrorTermMw()).isCloseTo(20.0, within(1e-9));
        // at that term, ACE = 0 needs f = 50 - 0.02 Hz: the area runs frequency low
        assertThat(c.compute(new AceInputs(0, 0, 49.98, 50.0, 10.0, 0)).aceMw()).isCloseTo(0.0, within(1e-9));
        // small error, not clamped: offset = -0.36*50/3600 = -0.005 Hz -> +5 MW
        assertThat(c.compute(new AceInputs(0, 0, 50.0, 50.0, 0.36, 0)).timeErrorTermMw()).isCloseTo(5.0, within(1e-9));
    }

    @Test
    void shouldPayBackInadvertentByExportingLess() {
        AceCalculator c = new AceCalculator(AreaControlSettings.builder("X").northAmericanBias(-50)
                .inadvertentPayback(4, 50).build());
        AceResult r = c.compute(new AceInputs(0, 0, 60, 60, 0, 100));
        assertThat(r.paybackTermMw()).isCloseTo(25.0, within(1e-9));
        assertThat(c.compute(new AceInputs(-25, 0, 60, 60, 0, 100)).aceMw()).isCloseTo(0.0, within(1e-9));
        assertThat(c.compute(new AceInputs(0, 0, 60, 60, 0, 1000)).paybackTermMw()).isCloseTo(50.0, within(1e-9));
    }

    @Test
    void shouldRejectWrongBiasSignsWithClearMessage() {
        assertThatThrownBy(() -> AreaControlSettings.builder("A1").northAmericanBias(34.3).build())
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("B must be negative").hasMessageContaining("did you mean B = -34.3");
        assertThatThrownBy(() -> AreaControlSettings.builder("A1").europeanK(-343).build())
                .hasMessageContaining("K must be positive");
        assertThatThrownBy(() -> AreaControlSettings.builder("bad id").nominalFrequencyHz(10).build())
                .hasMessageContaining("areaId").hasMessageContaining("a bias is required")
                .hasMessageContaining("nominalFrequencyHz");
    }
}
