package org.loopstand.controller.intake;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class SeqTrackerTest {
    @Test
    void shouldTakeOneHugeJumpOnceAndGoOnWithTheRealSeries() {
        SeqTracker s = new SeqTracker();
        s.accept(100);
        s.accept(101);
        assertThat(s.accept(101 + 1_000_000_000L)).isEqualTo(SeqTracker.Outcome.JUMP);
        // the real scans that follow are used, not "out of order" for ever
        for (long seq = 102; seq < 200; seq++) {
            assertThat(s.accept(seq)).as("seq " + seq).isEqualTo(SeqTracker.Outcome.IN_ORDER);
        }
        assertThat(s.jumpCount()).isEqualTo(1);
        assertThat(s.revokedJumpCount()).isEqualTo(1);
        assertThat(s.outOfOrderCount()).isZero();
        assertThat(s.missingCount()).as("a jump is not a billion lost messages").isZero();
    }

    @Test
    void shouldConfirmAJumpThatTheNextMessagesContinue() {
        SeqTracker s = new SeqTracker();
        s.accept(1_700_000_000_000L);
        s.accept(1_700_000_000_001L);
        // the publisher restarted: it numbers from its new start time in epoch ms
        assertThat(s.accept(1_700_000_090_000L)).isEqualTo(SeqTracker.Outcome.JUMP);
        assertThat(s.accept(1_700_000_090_001L)).isEqualTo(SeqTracker.Outcome.IN_ORDER);
        assertThat(s.accept(1_700_000_000_002L)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.revokedJumpCount()).isZero();
        assertThat(s.highestSeq()).isEqualTo(1_700_000_090_001L);
    }

    @Test
    void shouldFollowAPublisherThatRestartedFromALowerNumber() {
        SeqTracker s = new SeqTracker();
        for (long seq = 5_000; seq < 5_010; seq++) {
            s.accept(seq);
        }
        assertThat(s.accept(0)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.accept(1)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.accept(2)).isEqualTo(SeqTracker.Outcome.RESTART);
        assertThat(s.accept(3)).isEqualTo(SeqTracker.Outcome.IN_ORDER);
        assertThat(s.restartCount()).isEqualTo(1);
    }

    @Test
    void shouldTakeLateDeliveriesCloseBehindForOutOfOrderNotForARestart() {
        SeqTracker s = new SeqTracker();
        s.accept(100);
        for (long seq = 95; seq < 100; seq++) {
            assertThat(s.accept(seq)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        }
        assertThat(s.restartCount()).isZero();
    }

    @Test
    void shouldNotTakeScatteredOldMessagesForARestart() {
        SeqTracker s = new SeqTracker();
        for (long seq = 5_000; seq < 5_010; seq++) {
            s.accept(seq);
        }
        assertThat(s.accept(7)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.accept(3)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.accept(5_010)).isEqualTo(SeqTracker.Outcome.IN_ORDER);
        assertThat(s.accept(5)).isEqualTo(SeqTracker.Outcome.OUT_OF_ORDER);
        assertThat(s.restartCount()).isZero();
    }
}
