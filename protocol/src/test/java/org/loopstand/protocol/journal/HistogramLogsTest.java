package org.loopstand.protocol.journal;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.HdrHistogram.Histogram;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.time.VirtualClock;

class HistogramLogsTest {
    @TempDir
    Path dir;

    @Test
    void shouldWriteIntervalsStampedByTheInjectedClockAndAddThemUp() throws Exception {
        VirtualClock clock = new VirtualClock(1_700_000_000_000L);
        Path file = dir.resolve("controller.hlog");
        HistogramLogs logs = HistogramLogs.create(file, clock, 60_000_000L, 3, 1000);
        for (int v = 1; v <= 100; v++) {
            logs.record("commandLatencyUs", v * 100L); // 100 … 10,000 µs
        }
        logs.record("commandLatencyUs", -5); // clock skew: recorded as 0 and counted
        clock.advanceMillis(999);
        assertThat(logs.writeIntervalIfDue()).isFalse();
        clock.advanceMillis(1);
        assertThat(logs.writeIntervalIfDue()).isTrue();
        logs.record("commandLatencyUs", 20_000);
        clock.advanceMillis(500);
        logs.close();

        List<String> lines = Files.readAllLines(file);
        // Interval lines: Tag=…,startSec,lengthSec,max,… relative to the base time (the clock's start).
        assertThat(lines).anyMatch(l -> l.startsWith("Tag=commandLatencyUs,0.000,1.000,"));
        assertThat(lines).anyMatch(l -> l.startsWith("Tag=commandLatencyUs,1.000,0.500,"));
        assertThat(lines).contains("#clamped commandLatencyUs 1");

        HistogramLogs.Totals totals = HistogramLogs.readTotals(file);
        Histogram h = totals.histograms().get("commandLatencyUs");
        assertThat(totals.tornTail()).isFalse();
        assertThat(h.getTotalCount()).isEqualTo(102);
        assertThat(h.getMinValue()).isZero();
        // 3 significant digits: 20,000 is kept within 0.1 %.
        assertThat((double) h.getMaxValue()).isBetween(19_980.0, 20_020.0);
        // Median of {0, 100, …, 10,000, 20,000} (102 values): the 51st value is 5,000 µs.
        assertThat((double) h.getValueAtPercentile(50)).isBetween(4_995.0, 5_005.0);
    }

    @Test
    void shouldReportATornLastIntervalLineAndKeepTheCompleteOnes() throws Exception {
        VirtualClock clock = new VirtualClock(1_700_000_000_000L);
        Path file = dir.resolve("plant.hlog");
        HistogramLogs logs = HistogramLogs.create(file, clock, 1_000_000L, 2, 1000);
        logs.record("ageAtUseMs", 40);
        logs.record("ageAtUseMs", 60);
        clock.advanceMillis(1000);
        logs.writeInterval();
        logs.close();
        String text = Files.readString(file);
        // A killed writer: half of a further interval line.
        String line = text.lines().filter(l -> l.startsWith("Tag=")).findFirst().orElseThrow();
        Files.writeString(file, text + line.substring(0, line.length() / 2), java.nio.file.StandardOpenOption.TRUNCATE_EXISTING);
        HistogramLogs.Totals totals = HistogramLogs.readTotals(file);
        assertThat(totals.tornTail()).isTrue();
        assertThat(totals.histograms().get("ageAtUseMs").getTotalCount()).isEqualTo(2);
    }
}
