package org.loopstand.app.replay;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.controller.runtime.InputEntries;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.time.VirtualClock;

/**
 * A bus link that drops and comes back, replayed: a controller on a virtual clock is fed the recorded
 * real-time run's first 300 inputs at their arrival times while its link goes down for a while (the
 * cause as a transport would report it), and its journal replays entry for entry, the cycles without a
 * link included.
 */
class LinkChangeReplayTest {
    static final Path RECORDED = RecordedRehearsalReplayTest.RECORDED;
    static final String CAUSE = "java.io.EOFException: broker closed the connection";

    @TempDir
    Path dir;

    @Test
    void shouldReplayALinkThatWentDownAndCameBack() throws Exception {
        ControllerSiteConfig site = ControllerSiteReader.read(RECORDED.resolve("site.yaml"));
        List<JournalEntry> inputs = JournalReader.readAll(RECORDED.resolve("controller.jsonl")).entries().stream()
                .filter(e -> e.kind().equals(InputEntries.KIND)).limit(300).toList();
        long startMs = inputs.get(0).get("atMs").asLong();
        VirtualClock clock = new VirtualClock(startMs);
        ReplayBus bus = new ReplayBus("controller-1", true);
        Path run = Files.createDirectory(dir.resolve("run"));
        JournalWriter journal = JournalWriter.create(run.resolve("controller.jsonl"), "controller", startMs,
                java.util.Map.of("site", site.siteId(), "controllerId", "controller-1"), clock, JournalWriter.DEFAULT_FLUSH_INTERVAL);
        ControllerAgent agent = new ControllerAgent(site, bus, clock, null, "controller-1", startMs, journal, null);
        agent.onStart();
        for (int i = 0; i < inputs.size(); i++) {
            JournalEntry e = inputs.get(i);
            clock.advanceMillis(Math.max(0, e.get("atMs").asLong() - clock.epochMillis()));
            agent.doWork(); // cycles due before this arrival
            if (i == 100) {
                bus.linkDown(CAUSE);
            } else if (i == 200) {
                bus.linkUp(true);
            }
            bus.deliver(e.text("topic"), InputEntries.payloadOf(e.fields()), clock.monotonicNanos());
            agent.doWork();
        }
        agent.onClose();
        List<JournalEntry> written = JournalReader.readAll(run.resolve("controller.jsonl")).entries();
        assertThat(written).filteredOn(e -> "busLinkDown".equals(e.text("event"))).singleElement()
                .satisfies(e -> assertThat(e.text("cause")).isEqualTo(CAUSE));
        assertThat(written).filteredOn(e -> "busReconnected".equals(e.text("event"))).hasSize(1);
        List<JournalEntry> offline = written.stream().filter(e -> e.kind().equals("decided"))
                .filter(e -> !e.get("linkUp").asBoolean()).toList();
        assertThat(offline).isNotEmpty().allSatisfy(e -> assertThat(e.get("reasons").toString()).contains("busLinkDown"));

        JournalReplay.Result r = new JournalReplay(RecordedJournal.read(run), site).run(Files.createDirectory(dir.resolve("work")));

        assertThat(r.divergence()).isNull();
        assertThat(r.decisionsMatched()).isEqualTo(agent.cyclesRun());
        assertThat(r.inputsFed()).isEqualTo(300);
        assertThat(r.entriesCompared()).isEqualTo(written.size() + 1); // and the end entry
    }
}
