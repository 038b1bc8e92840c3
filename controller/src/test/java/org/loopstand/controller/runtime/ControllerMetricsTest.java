package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.metrics.PrometheusPage;
import org.loopstand.protocol.time.VirtualClock;

/**
 * The controller's metrics page on a closed-loop study with a load step: it parses as Prometheus text
 * and its counters match the controller's journal (cycles, commands, intake rejections, acks).
 */
class ControllerMetricsTest {
    @Test
    void shouldCountWhatTheJournalRecords(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(),
                JournalWriter.create(file, "controller", StudyLoop.START_MS, new VirtualClock(0)));
        loop.runTo(40);
        loop.sim.stepLoadMw("area1", 100);
        loop.tap.silentAreas.add("area2"); // stale inputs: the intake and the interlocks have something to say
        loop.runTo(70);
        loop.tap.silentAreas.clear();
        loop.runTo(121);
        PrometheusPage page = PrometheusPage.parse(loop.agent.metrics().get());
        loop.agent.onClose();

        List<JournalEntry> j = JournalReader.readAll(file).entries();
        long sent = j.stream().filter(e -> e.kind().equals(JournalFormat.KIND_SENT)).count();
        assertThat(sent).isPositive();
        assertThat(page.value("loopstand_controller_commands_sent_total", "kind", "pulse")).isEqualTo((double) sent);
        Map<String, Long> cyclesByState = new TreeMap<>();
        j.stream().filter(e -> e.kind().equals(JournalFormat.KIND_DECIDED))
                .forEach(e -> cyclesByState.merge(e.text("state"), 1L, Long::sum));
        assertThat(cyclesByState).isNotEmpty();
        cyclesByState.forEach((state, n) ->
                assertThat(page.value("loopstand_controller_cycles_total", "state", state)).as(state).isEqualTo((double) n));
        assertThat(page.samples("loopstand_controller_cycles_total")).hasSize(cyclesByState.size());
        Map<String, Long> rejected = new TreeMap<>();
        j.stream().filter(e -> e.kind().equals(JournalFormat.KIND_REFUSED) && e.text("topic") != null)
                .forEach(e -> rejected.merge(e.text("reason"), 1L, Long::sum));
        rejected.forEach((reason, n) -> assertThat(page.value("loopstand_controller_intake_rejected_total", "reason", reason))
                .as(reason).isEqualTo((double) n));
        long received = j.stream().filter(e -> e.kind().equals(JournalFormat.KIND_RECEIVED)).count();
        assertThat(page.value("loopstand_controller_acks_total", "outcome", "accepted")).isEqualTo((double) received);
        assertThat(page.value("loopstand_controller_cycle_duration_seconds_count")).isEqualTo((double) loop.agent.cyclesRun());
        assertThat(page.types).containsEntry("loopstand_controller_cycle_jitter_seconds", "summary")
                .containsEntry("jvm_threads_live", "gauge");
    }
}
