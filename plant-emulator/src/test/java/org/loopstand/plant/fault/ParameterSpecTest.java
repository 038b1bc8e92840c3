package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class ParameterSpecTest {
    @Test
    void shouldShowTheQuotesOfTextGivenWhereANumberIsDue() {
        ParameterSpec withinS = ParameterSpec.number("withinS", "s", 0, 31_536_000, 900.0, "time allowed");
        // withinS: "350" in a scenario: without its quotes the refusal read "got 350", which looks right
        assertThat(withinS.check("350")).contains("withinS must be a finite number (s), got the text \"350\""
                + " (write numbers without quotes)");
        assertThat(withinS.check(350)).isEmpty();
        assertThat(withinS.check(-5)).contains("withinS must lie in [0, 31536000] s, got -5");
    }
}
