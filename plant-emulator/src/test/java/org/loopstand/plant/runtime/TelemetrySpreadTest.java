package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.time.VirtualClock;

/**
 * The spread schedule stepped by hand on a virtual clock: when each message leaves, in what order,
 * and what happens when the publisher is behind or the slots would be too close. Slot rule
 * (markedAt + i × period / n) is this project's design (common practice for paced senders, no source).
 */
class TelemetrySpreadTest {
    static final long STEP_NANOS = 20_000_000L; // the plant's 20 ms physics step at rate 1
    final VirtualClock clock = new VirtualClock(1_700_000_000_000L);
    final List<String> sent = new ArrayList<>();
    final List<Long> sentAtNanos = new ArrayList<>();
    final Object connA = new Object();
    final Object connB = new Object();

    /** Runs the schedule the way the publisher thread does, but every 100 µs of virtual time. */
    void runUntil(TelemetrySpread<String> spread, long endNanos) {
        while (clock.monotonicNanos() <= endNanos) {
            long now = clock.monotonicNanos();
            spread.sendDue(now, m -> {
                sent.add(m);
                sentAtNanos.add(now);
            });
            clock.advanceNanos(100_000);
        }
    }

    @Test
    void shouldSendAStepsTelemetryEvenlyOverTheStepInOrderAndAllOfIt() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long t0 = clock.monotonicNanos();
        spread.stepBegins();
        for (int i = 0; i < 4; i++) {
            spread.offer(i % 2 == 0 ? connA : connB, "u" + i, true, t0);
        }
        spread.stepEnds(t0, STEP_NANOS, t0);
        // nothing leaves before its slot: 5 ms apart (20 ms / 4)
        assertThat(spread.sendDue(t0, sent::add)).isEqualTo(t0 + 5_000_000L);
        assertThat(sent).containsExactly("u0");
        sent.clear();
        runUntil(spread, t0 + STEP_NANOS);
        assertThat(sent).containsExactly("u1", "u2", "u3");
        assertThat(sentAtNanos).containsExactly(t0 + 5_000_000L, t0 + 10_000_000L, t0 + 15_000_000L);
        assertThat(spread.waitingCount()).isZero();
        assertThat(spread.spread()).isEqualTo(4);
        assertThat(spread.sent()).isEqualTo(4);
        assertThat(spread.sentAtOnceBehind() + spread.sentAtOnceDense() + spread.sentEarlyForOrder()).isZero();
    }

    @Test
    void shouldSendAnAckAtOnceTakingItsConnectionsEarlierTelemetryButNotTheOthers() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long t0 = clock.monotonicNanos();
        spread.stepBegins();
        spread.offer(connA, "a-tel1", true, t0);
        spread.offer(connB, "b-tel1", true, t0);
        spread.offer(connA, "a-tel2", true, t0);
        spread.offer(connB, "b-tel2", true, t0);
        spread.stepEnds(t0, STEP_NANOS, t0); // slots 0, 5, 10, 15 ms
        runUntil(spread, t0 + 900_000L);
        // an ack of connection A at 1 ms: A's waiting telemetry (slot 10 ms) goes first, B's keeps its slots
        spread.offer(connA, "a-ack", false, clock.monotonicNanos());
        runUntil(spread, t0 + STEP_NANOS);
        assertThat(sent).containsExactly("a-tel1", "a-tel2", "a-ack", "b-tel1", "b-tel2");
        assertThat(sentAtNanos).containsExactly(t0, t0 + 1_000_000L, t0 + 1_000_000L, t0 + 5_000_000L,
                t0 + 15_000_000L);
        assertThat(spread.sentEarlyForOrder()).isEqualTo(1);
        assertThat(spread.spread()).isEqualTo(3); // a-tel2 left its slot for the ack
    }

    @Test
    void shouldSendAtOnceAndCountWhenTheNextStepComesWhileTheLastIsStillSpreading() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long t0 = clock.monotonicNanos();
        spread.stepBegins();
        spread.offer(connA, "s1-a", true, t0);
        spread.offer(connA, "s1-b", true, t0);
        spread.stepEnds(t0, STEP_NANOS, t0);
        runUntil(spread, t0 + 5_000_000L); // s1-b's slot is at 10 ms
        long t1 = clock.monotonicNanos();
        spread.stepBegins();
        spread.offer(connA, "s2-a", true, t1);
        spread.offer(connA, "s2-b", true, t1);
        spread.stepEnds(t1, STEP_NANOS, t1);
        runUntil(spread, t1 + STEP_NANOS);
        assertThat(sent).containsExactly("s1-a", "s1-b", "s2-a", "s2-b");
        assertThat(sentAtNanos).containsExactly(t0, t1, t1, t1 + 10_000_000L);
        assertThat(spread.sentAtOnceBehind()).isEqualTo(1);
        assertThat(spread.spread()).isEqualTo(3);
        assertThat(spread.waitingCount()).isZero();
    }

    @Test
    void shouldSendAStepAtOnceAndCountWhenItsMarkArrivesMoreThanAPeriodLate() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long marked = clock.monotonicNanos();
        spread.stepBegins();
        for (int i = 0; i < 3; i++) {
            spread.offer(connA, "u" + i, true, marked);
        }
        clock.advanceNanos(STEP_NANOS + 1);
        spread.stepEnds(marked, STEP_NANOS, clock.monotonicNanos());
        runUntil(spread, clock.monotonicNanos());
        assertThat(sent).containsExactly("u0", "u1", "u2");
        assertThat(sentAtNanos).containsOnly(marked + STEP_NANOS + 1);
        assertThat(spread.sentAtOnceBehind()).isEqualTo(3);
        assertThat(spread.spread()).isZero();
    }

    @Test
    void shouldSendAStepAtOnceAndCountWhenItsSlotsWouldBeCloserThanTheMinimumGap() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long t0 = clock.monotonicNanos();
        spread.stepBegins();
        for (int i = 0; i < 500; i++) { // 20 ms / 500 = 40 µs < 50 µs
            spread.offer(connA, "u" + i, true, t0);
        }
        spread.stepEnds(t0, STEP_NANOS, t0);
        assertThat(spread.sendDue(t0, sent::add)).isEqualTo(Long.MAX_VALUE);
        assertThat(sent).hasSize(500).startsWith("u0", "u1").endsWith("u498", "u499");
        assertThat(spread.sentAtOnceDense()).isEqualTo(500);
    }

    @Test
    void shouldHoldAStepsTelemetryUntilItsPassEndsAndSendOtherMessagesAtOnce() {
        TelemetrySpread<String> spread = new TelemetrySpread<>(50_000);
        long t0 = clock.monotonicNanos();
        spread.offer(connB, "meter", false, t0);
        spread.offer(connB, "idle-pass-telemetry", true, t0); // outside a step pass: not spread
        spread.stepBegins();
        spread.offer(connA, "u0", true, t0);
        assertThat(spread.sendDue(t0, sent::add)).isEqualTo(Long.MAX_VALUE);
        assertThat(sent).containsExactly("meter", "idle-pass-telemetry");
        assertThat(spread.waitingCount()).isEqualTo(1);
        spread.stepEnds(t0, STEP_NANOS, t0);
        spread.sendDue(t0, sent::add);
        assertThat(sent).containsExactly("meter", "idle-pass-telemetry", "u0");
    }
}
