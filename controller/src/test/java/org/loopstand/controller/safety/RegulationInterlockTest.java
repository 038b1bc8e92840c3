package org.loopstand.controller.safety;

import org.loopstand.controller.config.InterlockSettings;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Set;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.intake.ValidationReason;

class RegulationInterlockTest {
    private static InterlockCheck clear() {
        return new InterlockCheck().busLink(true).frequency("areaA", true).tieFlow("areaA", "t1", true)
                .schedule("areaA", true).ace("areaA", 40, 2000);
    }

    @Test
    void shouldStartSuspendedAndResumeAfterClearCycles() {
        RegulationInterlock il = new RegulationInterlock(new InterlockSettings(2000, 3));
        assertThat(il.evaluate(clear()).mayCommand()).isFalse();
        assertThat(il.evaluate(clear()).clearCycles()).isEqualTo(2);
        InterlockDecision third = il.evaluate(clear());
        assertThat(third.mayCommand()).isTrue();
        assertThat(third.resumedNow()).isTrue();
        assertThat(il.evaluate(clear()).resumedNow()).isFalse();
    }

    @Test
    void shouldSuspendOnUnusableFrequency() {
        RegulationInterlock il = running();
        InterlockDecision d = il.evaluate(new InterlockCheck().busLink(true).frequency("areaA", false));
        assertThat(d.mayCommand()).isFalse();
        assertThat(d.suspendedNow()).isTrue();
        assertThat(d.reasons()).containsExactly("frequencyUnusable:areaA");
    }

    @Test
    void shouldSuspendOnUnusableTieFlow() {
        InterlockDecision d = running().evaluate(new InterlockCheck().tieFlow("areaA", "t2", false));
        assertThat(d.reasons()).containsExactly("tieFlowUnusable:areaA:t2");
        assertThat(d.mayCommand()).isFalse();
    }

    @Test
    void shouldSuspendOnBusLinkDown() {
        InterlockDecision d = running().evaluate(new InterlockCheck().busLink(false));
        assertThat(d.reasons()).containsExactly("busLinkDown");
    }

    @Test
    void shouldSuspendOnAceBeyondSanityLimit() {
        InterlockDecision d = running().evaluate(new InterlockCheck().ace("areaA", -2500, 2000));
        assertThat(d.reasons()).containsExactly("aceBeyondSanityLimit:areaA");
        assertThat(running().evaluate(new InterlockCheck().ace("areaA", Double.NaN, 2000)).mayCommand()).isFalse();
    }

    @Test
    void shouldRestartClearCountWhenAReasonReturns() {
        RegulationInterlock il = new RegulationInterlock(new InterlockSettings(2000, 2));
        il.evaluate(clear());
        il.evaluate(new InterlockCheck().busLink(false));
        assertThat(il.evaluate(clear()).mayCommand()).isFalse();
        assertThat(il.evaluate(clear()).mayCommand()).isTrue();
    }

    @Test
    void shouldGiveUsableValueOnlyForValidatedUsableInput() {
        assertThat(UsableValue.from(ValidatedValue.good(50.0, 100))).get().extracting(UsableValue::value).isEqualTo(50.0);
        assertThat(UsableValue.from(ValidatedValue.unusable(Set.of(ValidationReason.STALE), 9000))).isEmpty();
        assertThat(UsableValue.from(null)).isEmpty();
    }

    private static RegulationInterlock running() {
        RegulationInterlock il = new RegulationInterlock(new InterlockSettings(2000, 1));
        il.evaluate(clear());
        return il;
    }
}
