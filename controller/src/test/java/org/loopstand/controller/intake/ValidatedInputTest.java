package org.loopstand.controller.intake;

import org.loopstand.controller.config.InputValidationSettings;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;

class ValidatedInputTest {
    private static final long T0 = 1_700_000_000_000L;

    private static MeasuredValue sample(double v, long tMs, long seq) {
        return new MeasuredValue(v, tMs, tMs + 20, true, seq);
    }

    @Test
    void shouldAcceptFreshGoodValue() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("frequency:A").maxAgeMs(8000)
                .range(45, 55).build());
        in.acceptPrimary(sample(50.01, T0, 1));
        ValidatedValue v = in.evaluate(T0 + 1000);
        assertThat(v.usable()).isTrue();
        assertThat(v.value()).isEqualTo(50.01);
        assertThat(v.ageMs()).isEqualTo(1000);
        assertThat(v.reasons()).isEmpty();
    }

    @Test
    void shouldDeclareStaleValueUnusable() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").maxAgeMs(8000).build());
        in.acceptPrimary(sample(50, T0, 1));
        ValidatedValue v = in.evaluate(T0 + 8001);
        assertThat(v.usable()).isFalse();
        assertThat(v.reasons()).contains(ValidationReason.STALE);
        assertThat(new ValidatedInput(InputValidationSettings.builder("f").build()).evaluate(T0).reasons())
                .containsExactly(ValidationReason.NO_DATA);
    }

    @Test
    void shouldRejectBadQualityRangeAndRate() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").range(45, 55).maxRatePerS(0.5).build());
        in.acceptPrimary(new MeasuredValue(50, T0, T0, false, 1));
        assertThat(in.evaluate(T0).reasons()).contains(ValidationReason.BAD_QUALITY);
        in.acceptPrimary(sample(60, T0 + 1000, 2));
        assertThat(in.evaluate(T0 + 1000).reasons()).contains(ValidationReason.OUT_OF_RANGE);
        in.acceptPrimary(sample(50, T0 + 2000, 3));
        in.acceptPrimary(sample(50.2, T0 + 3000, 4));
        assertThat(in.evaluate(T0 + 3000).usable()).isTrue();
        in.acceptPrimary(sample(51.0, T0 + 4000, 5)); // 0.8 Hz/s > 0.5 Hz/s
        ValidatedValue v = in.evaluate(T0 + 4000);
        assertThat(v.usable()).isFalse();
        assertThat(v.reasons()).contains(ValidationReason.RATE_OF_CHANGE);
    }

    @Test
    void shouldTrackSequence() {
        SeqTracker s = new SeqTracker();
        assertThat(s.accept(5)).isEqualTo(SeqTracker.Outcome.FIRST);
        assertThat(s.accept(6)).isEqualTo(SeqTracker.Outcome.IN_ORDER);
        assertThat(s.accept(9)).isEqualTo(SeqTracker.Outcome.GAP);
        assertThat(s.accept(9)).isEqualTo(SeqTracker.Outcome.DUPLICATE);
        assertThat(s.accept(7)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.missingCount()).isEqualTo(2);
        assertThat(s.highestSeq()).isEqualTo(9);
    }

    @Test
    void shouldNotLetDuplicateOrOldSampleReplaceLatest() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").build());
        in.acceptPrimary(sample(50.0, T0, 10));
        assertThat(in.acceptPrimary(sample(49.0, T0 - 4000, 9))).containsExactly(ValidationReason.OUT_OF_ORDER);
        assertThat(in.acceptPrimary(sample(48.0, T0, 10))).containsExactly(ValidationReason.DUPLICATE);
        assertThat(in.evaluate(T0 + 100).value()).isEqualTo(50.0);
        assertThat(in.acceptPrimary(sample(50.1, T0 + 4000, 13))).containsExactly(ValidationReason.SEQ_GAP);
        ValidatedValue v = in.evaluate(T0 + 4000);
        assertThat(v.usable()).isTrue();
        assertThat(v.reasons()).containsExactly(ValidationReason.SEQ_GAP);
    }

    @Test
    void shouldDetectFrozenValueOnlyWhenTimeAdvances() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").frozen(3000, 3, 0.0).build());
        for (int i = 0; i < 3; i++) {
            in.acceptPrimary(sample(50.0, T0 + i * 1000L, i));
        }
        assertThat(in.evaluate(T0 + 2000).usable()).isTrue();
        in.acceptPrimary(new MeasuredValue(50.0, T0 + 2000, T0 + 3000, true, 3)); // same source time: a repeat
        assertThat(in.evaluate(T0 + 3000).usable()).isTrue();
        in.acceptPrimary(sample(50.0, T0 + 3000, 4));
        ValidatedValue v = in.evaluate(T0 + 3000);
        assertThat(v.usable()).isFalse();
        assertThat(v.reasons()).contains(ValidationReason.FROZEN);
        in.acceptPrimary(sample(50.003, T0 + 4000, 5));
        assertThat(in.evaluate(T0 + 4000).usable()).isTrue();
    }

    /**
     * Frozen after 22 s of scenario time: with every 2 s scan the 12th reading (22 s) decides; with
     * three scans lost inside the run the verdict comes at the same 22 s, not three scans later as a
     * count of twelve readings would have it; and the verdict does not depend on when the readings
     * arrive (receipt times at a replay rate of 40 give the same answer as at 1).
     */
    @Test
    void shouldJudgeAFreezeInScenarioTimeWhateverScansAreLostOrHowFastTheyArrive() {
        InputValidationSettings s = InputValidationSettings.builder("f").frozen(22_000, 6, 0.0).build();
        for (double rate : new double[] {1, 40}) {
            SourceValidator all = new SourceValidator(s);
            SourceValidator lossy = new SourceValidator(s);
            long frozenAllAtMs = -1;
            long frozenLossyAtMs = -1;
            for (int i = 0; i <= 15; i++) {
                long sourceMs = T0 + i * 2000L;
                long receivedMs = T0 + (long) (i * 2000L / rate);
                MeasuredValue m = new MeasuredValue(49.987, sourceMs, receivedMs, true, i);
                if (all.accept(m).contains(ValidationReason.FROZEN) && frozenAllAtMs < 0) {
                    frozenAllAtMs = sourceMs - T0;
                }
                boolean lost = i == 3 || i == 6 || i == 9; // three scans lost inside the run
                if (!lost && lossy.accept(m).contains(ValidationReason.FROZEN) && frozenLossyAtMs < 0) {
                    frozenLossyAtMs = sourceMs - T0;
                }
            }
            assertThat(frozenAllAtMs).as("rate %s", rate).isEqualTo(22_000);
            assertThat(frozenLossyAtMs).as("rate %s", rate).isEqualTo(22_000);
        }
    }

    @Test
    void shouldNotCallTwoEqualReadingsFarApartAFreeze() {
        SourceValidator v = new SourceValidator(InputValidationSettings.builder("f").frozen(22_000, 6, 0.0).build());
        // a meter heard only every 12 s for a while: three equal readings span 24 s but are too few
        for (int i = 0; i < 3; i++) {
            assertThat(v.accept(sample(49.987, T0 + i * 12_000L, i))).doesNotContain(ValidationReason.FROZEN);
        }
        assertThat(v.identicalRun()).isEqualTo(3);
        assertThat(v.identicalSpanMs()).isEqualTo(24_000);
    }

    @Test
    void shouldHoldLastGoodForHoldTimeThenGiveUp() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").maxAgeMs(8000).holdLastGood(10_000).build());
        in.acceptPrimary(sample(49.9, T0, 1));
        in.acceptPrimary(new MeasuredValue(0, T0 + 2000, T0 + 2000, false, 2));
        ValidatedValue held = in.evaluate(T0 + 17_000);
        assertThat(held.usable()).isTrue();
        assertThat(held.held()).isTrue();
        assertThat(held.value()).isEqualTo(49.9);
        assertThat(held.reasons()).contains(ValidationReason.HELD_LAST_GOOD, ValidationReason.BAD_QUALITY);
        ValidatedValue gone = in.evaluate(T0 + 18_001);
        assertThat(gone.usable()).isFalse();
        assertThat(gone.reasons()).contains(ValidationReason.HOLD_EXPIRED);
    }

    @Test
    void shouldUseAlternateSourceWhenPrimaryFails() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").maxAgeMs(8000).alternateSource().build());
        in.acceptPrimary(sample(50.0, T0, 1));
        in.acceptAlternate(sample(50.02, T0 + 9000, 1));
        ValidatedValue v = in.evaluate(T0 + 9000);
        assertThat(v.usable()).isTrue();
        assertThat(v.value()).isEqualTo(50.02);
        assertThat(v.reasons()).contains(ValidationReason.STALE, ValidationReason.ALTERNATE_SOURCE);
        assertThat(in.evaluate(T0 + 20_000).usable()).isFalse();
        ValidatedInput noAlt = new ValidatedInput(InputValidationSettings.builder("f").build());
        assertThatThrownBy(() -> noAlt.acceptAlternate(sample(50, T0, 1))).hasMessageContaining("no alternate source");
    }

    @Test
    void shouldReportClockSkewBothWays() {
        ValidatedInput in = new ValidatedInput(InputValidationSettings.builder("f").clockSkewLimitMs(2000).build());
        // source clock 5 s ahead of ours: sample not used
        in.acceptPrimary(new MeasuredValue(50, T0 + 5000, T0, true, 1));
        ValidatedValue ahead = in.evaluate(T0);
        assertThat(ahead.usable()).isFalse();
        assertThat(ahead.reasons()).contains(ValidationReason.CLOCK_SKEW_AHEAD);
        assertThat(in.primary().lastClockSkewMs()).isEqualTo(5000);
        // source 3 s behind: reported, still young enough under a 10 s age limit
        in.acceptPrimary(new MeasuredValue(50, T0 + 1000, T0 + 4000, true, 2));
        ValidatedValue behind = in.evaluate(T0 + 4000);
        assertThat(behind.reasons()).contains(ValidationReason.CLOCK_SKEW_BEHIND);
        assertThat(behind.usable()).isTrue();
        assertThat(in.primary().maxClockSkewBehindMs()).isEqualTo(3000);
    }

    @Test
    void shouldNameEveryBadSetting() {
        assertThatThrownBy(() -> InputValidationSettings.builder("f").maxAgeMs(0).range(5, 1).frozen(1000, 1, -1).build())
                .hasMessageContaining("maxAgeMs").hasMessageContaining("range").hasMessageContaining("frozenMinReadings")
                .hasMessageContaining("frozenEpsilon");
    }
}
