package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.dispatch.InfeasibleDispatchException;

class DispatchCommandTest {
    /**
     * Wood & Wollenberg, Power Generation, Operation, and Control, Example 3A (from memory): heat
     * rates H1 = 510 + 7.2 P + 0.00142 P² (fuel 1.1 $/MBtu), H2 = 310 + 7.85 P + 0.00194 P²,
     * H3 = 78 + 7.97 P + 0.00482 P² (fuel 1.0), as costs: F1 = 561 + 7.92 P + 0.001562 P².
     */
    private static final String SITE = """
            siteId: ww3a
            areas:
              - {id: a1, nominalFrequencyHz: 60, aceConvention: northAmerican, biasMwPer01Hz: -50}
            units:
              - {id: u1, area: a1, minOutputMw: 150, maxOutputMw: 600, costA: 561, costB: 7.92, costC: 0.001562}
              - {id: u2, area: a1, minOutputMw: 100, maxOutputMw: 400, costA: 310, costB: 7.85, costC: 0.00194}
              - {id: u3, area: a1, minOutputMw: 50, maxOutputMw: 200, costA: 78, costB: 7.97, costC: 0.00482}
            """;

    private static double figure(String text, String regex) {
        Matcher m = Pattern.compile(regex).matcher(text);
        assertThat(m.find()).as("%s in%n%s", regex, text).isTrue();
        return Double.parseDouble(m.group(1));
    }

    @Test
    void shouldPrintTheEqualIncrementalCostDispatchOfTheTextbookExample() {
        ControllerSiteConfig site = ControllerSiteReader.read("ww3a.yaml", SITE);
        String out = DispatchCommand.render(site, 850, null);
        // Wood & Wollenberg Example 3A (from memory): λ ≈ 9.148 $/MWh, P ≈ 393.2 / 334.6 / 122.2 MW.
        // Re-derived: λ = (850 + Σ b/2c) / Σ 1/2c = (850 + 5385.1) / 681.57 = 9.1483
        assertThat(figure(out, "lambda ([0-9.]+)")).isBetween(9.147, 9.149);
        assertThat(figure(out, "u1 +([0-9.]+)")).isBetween(393.1, 393.3);
        assertThat(figure(out, "u2 +([0-9.]+)")).isBetween(334.5, 334.7);
        assertThat(figure(out, "u3 +([0-9.]+)")).isBetween(122.1, 122.3);
        // participation factors (Wood & Wollenberg, base point and participation factor method):
        // pf_i = (1/2c_i) / Σ 1/2c = 320.10/681.57, 257.73/681.57, 103.73/681.57
        assertThat(figure(out, "u1 .* ([0-9.]+)\\n")).isBetween(0.4695, 0.4699);
        assertThat(figure(out, "u2 .* ([0-9.]+)\\n")).isBetween(0.3779, 0.3783);
        assertThat(figure(out, "u3 .* ([0-9.]+)\\n")).isBetween(0.1520, 0.1524);
    }

    @Test
    void shouldMarkAUnitAtItsLimitAndGiveItNoParticipation() {
        ControllerSiteConfig site = ControllerSiteReader.read("ww3a.yaml", SITE);
        // at 1150 MW u2 would take more than 400 MW (its incremental cost at 400 MW, 7.85 + 0.00388·400
        // = 9.402, is below λ): held at 400; u1 and u3 share 750 MW at λ = (750 + 7.92·320.10 +
        // 7.97·103.73) / (320.10 + 103.73) = 9.7018 → P1 = 570.4, P3 = 179.6 MW (re-derived)
        String out = DispatchCommand.render(site, 1150, null);
        assertThat(out).containsPattern("u2 +400\\.0 .*at limit +0\\.0000");
        assertThat(figure(out, "lambda ([0-9.]+)")).isBetween(9.7013, 9.7023);
        double p1 = figure(out, "u1 +([0-9.]+)");
        double p3 = figure(out, "u3 +([0-9.]+)");
        assertThat(p1).isBetween(570.3, 570.5);
        assertThat(p3).isBetween(179.5, 179.7);
        assertThat(p1 + p3 + 400).isBetween(1149.9, 1150.1);
        // the free units share a load change by 320.10 : 103.73
        assertThat(figure(out, "u1 .* ([0-9.]+)\\n")).isBetween(0.7550, 0.7554);
    }

    @Test
    void shouldRefuseAnInfeasibleDemandAndASiteWithoutCosts() {
        ControllerSiteConfig site = ControllerSiteReader.read("ww3a.yaml", SITE);
        assertThatThrownBy(() -> DispatchCommand.render(site, 1300, null))
                .isInstanceOf(InfeasibleDispatchException.class).hasMessageContaining("1300");
        assertThatThrownBy(() -> DispatchCommand.render(site, 500, "a2"))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("area a2");
    }
}
