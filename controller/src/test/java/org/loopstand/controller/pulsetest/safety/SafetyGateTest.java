package org.loopstand.controller.pulsetest.safety;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.util.Optional;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.loopstand.controller.pulsetest.plan.PlanLimits;

class SafetyGateTest {
    private final ByteArrayOutputStream printed = new ByteArrayOutputStream();
    private final PrintStream out = new PrintStream(printed, true, StandardCharsets.UTF_8);

    private static BufferedReader typed(String text) {
        return new BufferedReader(new StringReader(text));
    }

    @ParameterizedTest
    @CsvSource({"tcp://127.0.0.1:1883,true", "tcp://localhost:1883,true", "ssl://[::1]:8883,true",
            "tcp://127.0.0.2:1883,true", "mem:,true", "tcp://10.1.2.3:1883,false",
            "ssl://broker.plant.example:8883,false", "tcp://0.0.0.0:1883,false", "not a url,false"})
    void shouldCountOnlyLoopbackAndInMemoryBrokersAsTestBrokers(String url, boolean test) {
        assertThat(SafetyGate.isTestBroker(url, false)).isEqualTo(test);
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {"tcp://127.0.0.1:1883,tcp://127.0.0.1:1884|true",
            "ssl://[::1]:8883, ssl://localhost:8884|true", "tcp://127.0.0.1:1883,tcp://192.0.2.10:1883|false",
            "tcp://192.0.2.10:1883,tcp://127.0.0.1:1883|false", "tcp://127.0.0.1:1883,|false"})
    void shouldCountABrokerNodeListAsATestBrokerOnlyWhenEveryNodeIsLoopback(String list, boolean test) {
        assertThat(SafetyGate.isTestBroker(list, false)).isEqualTo(test);
    }

    @Test
    void shouldRefuseANonTestBrokerWithoutLivePlant() {
        Optional<String> r = SafetyGate.admit("tcp://10.1.2.3:1883", false, false, "unit-a", typed("unit-a\n"), out);
        assertThat(r).get().asString().contains("not a test broker").contains("--live-plant");
    }

    @Test
    void shouldAcceptADeclaredTestBroker() {
        assertThat(SafetyGate.admit("tcp://10.1.2.3:1883", true, false, "unit-a", typed(""), out)).isEmpty();
    }

    @Test
    void shouldRefuseLivePlantWhenTheConfirmationDoesNotNameTheUnit() {
        Optional<String> r = SafetyGate.admit("tcp://10.1.2.3:1883", false, true, "unit-a", typed("yes\n"), out);
        assertThat(r).get().asString().contains("'yes' does not name unit unit-a");
        assertThat(printed.toString(StandardCharsets.UTF_8)).contains("Type the unit id (unit-a)");
    }

    @Test
    void shouldRefuseLivePlantWhenNothingIsTyped() {
        assertThat(SafetyGate.admit("tcp://10.1.2.3:1883", false, true, "unit-a", typed(""), out)).isPresent();
    }

    @Test
    void shouldAdmitLivePlantWhenTheUnitIdIsTyped() {
        assertThat(SafetyGate.admit("tcp://10.1.2.3:1883", false, true, "unit-a", typed("unit-a\n"), out)).isEmpty();
    }

    @Test
    void shouldTakeTheTighterOperatorCapOrThePlans() {
        assertThat(SafetyGate.caps(new PlanLimits(20, 900), 8.0, null)).isEqualTo(new PlanLimits(8, 900));
        assertThat(SafetyGate.caps(new PlanLimits(20, 900), null, 300.0)).isEqualTo(new PlanLimits(20, 300));
        assertThat(SafetyGate.caps(new PlanLimits(20, 900), 20.0, 900.0)).isEqualTo(new PlanLimits(20, 900));
    }

    @Test
    void shouldRefuseAnOperatorCapAboveThePlansInsteadOfClippingIt() {
        assertThatThrownBy(() -> SafetyGate.caps(new PlanLimits(20, 900), 50.0, 300.0))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("--max-excursion-mw must be a finite number in (0, 20.00] MW")
                .hasMessageContaining("got 50.0");
    }

    @Test
    void shouldRefuseNaNInfinitiesZeroAndNegativeCapsNamingEachOption() {
        for (double bad : new double[] {Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, 0, -5, 1e9}) {
            assertThatThrownBy(() -> SafetyGate.caps(new PlanLimits(20, 900), bad, bad))
                    .as("cap %s", bad)
                    .hasMessageContaining("--max-excursion-mw must be a finite number in (0, 20.00] MW")
                    .hasMessageContaining("--max-duration-s must be a finite number in (0, 900.00] s")
                    .hasMessageContaining("got " + bad);
        }
    }

    @Test
    void shouldAbortOnQOnly() {
        KeyAbortSwitch other = new KeyAbortSwitch(new java.io.ByteArrayInputStream("x\n".getBytes()));
        KeyAbortSwitch q = new KeyAbortSwitch(new java.io.ByteArrayInputStream("abq\n".getBytes()));
        assertThat(other.abortRequested()).isFalse();
        assertThat(q.abortRequested()).isTrue();
        assertThat(q.abortRequested()).isTrue();
    }

    @Test
    void shouldSeeAQTypedRightAfterTheConfirmation() {
        // The prompt's buffered reader takes in everything typed so far, the q after the unit id too;
        // the abort switch on the same reader must still find it (one on System.in would not).
        java.io.InputStream console = new java.io.ByteArrayInputStream("unit-a\nq\n".getBytes(StandardCharsets.UTF_8));
        BufferedReader reader = new BufferedReader(new java.io.InputStreamReader(console, StandardCharsets.UTF_8));
        assertThat(SafetyGate.admit("tcp://10.1.2.3:1883", false, true, "unit-a", reader, out)).isEmpty();
        assertThat(new KeyAbortSwitch(console).abortRequested()).isFalse(); // the raw stream is drained
        assertThat(new KeyAbortSwitch(reader).abortRequested()).isTrue();
    }
}
