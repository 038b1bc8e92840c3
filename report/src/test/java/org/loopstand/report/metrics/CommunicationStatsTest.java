package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.report.metrics.CommunicationStats.Received;

class CommunicationStatsTest {
    @Test
    void shouldCountLossDuplicatesAndReorderingFromSeqGaps() {
        // meter m1 arrives as seq 1, 2, 3, 5, 6, 6, 4, 9; telemetry u1 as 10, 11.
        List<Received> rx = List.of(new Received("areaMeter", "m1", 1), new Received("areaMeter", "m1", 2),
                new Received("areaMeter", "m1", 3), new Received("areaMeter", "m1", 5),
                new Received("areaMeter", "m1", 6), new Received("areaMeter", "m1", 6),
                new Received("areaMeter", "m1", 4), new Received("areaMeter", "m1", 9),
                new Received("unitTelemetry", "u1", 10), new Received("unitTelemetry", "u1", 11));
        CommunicationStats s = CommunicationStats.of(rx, new double[] {100, 300, 200, 400},
                new double[] {12, 15}, List.of("expired", "atLimit", "expired"), List.of("staleFrequency"), 4.0);
        // 8 meter messages over 4 s = 2 /s; 2 telemetry = 0.5 /s
        assertThat(s.ratesPerS()).containsEntry("areaMeter", 2.0).containsEntry("unitTelemetry", 0.5);
        CommunicationStats.StreamLoss m1 = s.streams().get(0);
        // expected 9 − 1 + 1 = 9; distinct {1,2,3,4,5,6,9} = 7; lost 2 (7, 8) = 22.22 %; one duplicate (6); 4 after 6 is out of order
        assertThat(m1.expected()).isEqualTo(9);
        assertThat(m1.received()).isEqualTo(7);
        assertThat(m1.lost()).isEqualTo(2);
        assertThat(m1.duplicates()).isEqualTo(1);
        assertThat(m1.outOfOrder()).isEqualTo(1);
        assertThat(m1.lossPct()).isCloseTo(22.222, within(1e-3));
        assertThat(s.streams().get(1).lost()).isZero();
        // ages sorted 100, 200, 300, 400: p50 rank 2 → 200; p90 rank ⌈3.6⌉ = 4 → 400
        assertThat(s.ageAtUseMs().p50()).isEqualTo(200);
        assertThat(s.ageAtUseMs().p90()).isEqualTo(400);
        assertThat(s.commandLatencyMs().max()).isEqualTo(15);
        assertThat(s.refusalsByReason()).containsExactly(java.util.Map.entry("expired", 2L),
                java.util.Map.entry("atLimit", 1L));
        assertThat(s.suspensionsByReason()).containsEntry("staleFrequency", 1L);
    }
}
