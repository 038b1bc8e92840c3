package org.loopstand.report.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

/** The 10 % nearness is a rule of thumb (common practice, no source); the figures are worked by hand. */
class CheckMarginTest {
    @Test
    void shouldMeasureTheFiguresDistanceFromItsLimitAsAShareOfTheLimit() {
        CheckResult near = new CheckResult("quarry-ace", true, "159 s", "170 s", "");
        assertThat(CheckMargin.shareOfLimit(near).getAsDouble()).isCloseTo(11 / 170.0, within(1e-12)); // 6.5 %
        assertThat(CheckMargin.near(near)).isTrue();
        assertThat(CheckMargin.near(new CheckResult("late", false, "181 s", "170 s", ""))).isTrue(); // 6.5 % over
        assertThat(CheckMargin.near(new CheckResult("wide", true, "422 s", "900 s", ""))).isFalse(); // 53 %
        assertThat(CheckMargin.near(new CheckResult("edge", true, "153 s", "170 s", ""))).isTrue(); // exactly 10 %
        assertThat(CheckMargin.near(new CheckResult("past", true, "152.9 s", "170 s", ""))).isFalse();
        assertThat(CheckMargin.describe(near)).startsWith("passed quarry-ace: 159 s against its limit 170 s, within 10 % of it");
    }

    @Test
    void shouldNotJudgeAFigureWithoutANumberAnotherUnitOrAZeroLimit() {
        assertThat(CheckMargin.shareOfLimit(new CheckResult("never", false, "n/a", "170 s", ""))).isEmpty();
        assertThat(CheckMargin.shareOfLimit(new CheckResult("units", true, "12 mHz", "12 s", ""))).isEmpty();
        assertThat(CheckMargin.shareOfLimit(new CheckResult("count", true, "0 commands", "0 commands", ""))).isEmpty();
        assertThat(CheckMargin.shareOfLimit(new CheckResult("bound", true, "880 s", "≤ 900 s", "")).getAsDouble())
                .isCloseTo(20 / 900.0, within(1e-12));
    }
}
