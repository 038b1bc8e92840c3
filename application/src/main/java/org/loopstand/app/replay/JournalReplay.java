package org.loopstand.app.replay;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.controller.runtime.InputEntries;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;

/**
 * Replays a recorded controller journal into a fresh built-in controller ({@link ControllerAgent} with the
 * site's controller settings and the recorded controller id) on a {@link ReplayClock}, then compares the
 * journal the replay wrote with the recorded one, entry for entry.
 *
 * <p>The recorded entries that drive the replay, in file order:
 * <ul>
 *   <li>{@code input}: the clock is set to its arrival time {@code atMs} and the payload handed to the
 *       bus subscription it matches (the intake stamps and queues it), then to the entry's time and the
 *       first half of the duty cycle runs ({@link ControllerAgent#drainArrivals()}): the input is routed;</li>
 *   <li>{@code event} busLinkDown / busConnected / busReconnected: the link changes, then the same half;</li>
 *   <li>{@code cycleClock}: one duty cycle ({@link ControllerAgent#doWork()}) with the monotonic time one ns
 *       before the recorded {@code t0Ns}, so the schedule starts there and no cycle runs yet;</li>
 *   <li>{@code decided}: one duty cycle with the clock at the entry's time and monotonic {@code pollNs}:
 *       the cycle runs as numbered, late and skipped as recorded;</li>
 *   <li>{@code event} summary: the controller stops ({@link ControllerAgent#onClose()}).</li>
 * </ul>
 * Everything else the recorded journal holds is what the controller made of these, and must come out the same,
 * apart from the {@code event}s {@code clockSilent} and {@code clockHeard}: facts about the plant's clock ticks
 * (docs/controller.md), which the replay's clock does not follow, so they are left out of the comparison.
 */
final class JournalReplay {
    /** What came out: counts, and the first divergence or null when every entry matched. */
    record Result(long decisionsMatched, long entriesCompared, long inputsFed, Divergence divergence) {
    }

    private final RecordedJournal recorded;
    private final ControllerSiteConfig site;

    JournalReplay(RecordedJournal recorded, ControllerSiteConfig site) {
        this.recorded = recorded;
        this.site = site;
    }

    /**
     * @param work an empty folder for the replayed journal
     * @throws ReplayRefused when the journal does not fit the site (another site, another cycle period)
     */
    Result run(Path work) throws ReplayRefused {
        if (!site.siteId().equals(recorded.siteId())) {
            throw new ReplayRefused(recorded.file() + ":1: journal of site '" + recorded.siteId() + "', the site file is '"
                    + site.siteId() + "'");
        }
        ReplayClock clock = new ReplayClock();
        clock.setEpochMillis(recorded.startedAtMs());
        ReplayBus bus = new ReplayBus(recorded.controllerId(), linkUpAtStart());
        Path file = work.resolve(RecordedJournal.FILE_NAME);
        JournalWriter journal = JournalWriter.create(file, "controller", recorded.startedAtMs(), headerExtras(), clock,
                JournalWriter.DEFAULT_FLUSH_INTERVAL);
        ControllerAgent agent = new ControllerAgent(site, bus, clock, null, recorded.controllerId(),
                recorded.startedAtMs(), journal, null);
        agent.onStart();
        long inputs = 0;
        boolean closed = false;
        for (JournalEntry e : recorded.entries()) {
            if (closed) {
                break;
            }
            try {
                closed = step(e, agent, bus, clock);
            } catch (IllegalStateException | IllegalArgumentException bad) {
                // a time that runs backwards, a payload that is no base64: the journal, not the controller, is wrong
                throw new ReplayRefused(recorded.file() + ":" + e.lineNumber() + ": " + bad.getMessage());
            }
            if (InputEntries.KIND.equals(e.kind())) {
                inputs++;
            }
        }
        if (!closed) {
            agent.onClose(); // a journal cut short: its entries are compared, the replay's closing ones are not
        }
        return compare(file, inputs);
    }

    /**
     * Does what one recorded entry asks for (nothing for an output).
     *
     * @return true when the controller has stopped
     */
    private boolean step(JournalEntry e, ControllerAgent agent, ReplayBus bus, ReplayClock clock) throws ReplayRefused {
        switch (e.kind()) {
            case InputEntries.KIND -> {
                clock.setEpochMillis(e.get("atMs").asLong());
                if (!bus.deliver(e.text("topic"), InputEntries.payloadOf(e.fields()), clock.monotonicNanos())) {
                    throw new ReplayRefused(recorded.file() + ":" + e.lineNumber() + ": input on topic " + e.text("topic")
                            + " that the controller of site " + site.siteId() + " does not subscribe to");
                }
                clock.setEpochMillis(e.tMs());
                agent.drainArrivals();
            }
            case InputEntries.KIND_CYCLE_CLOCK -> {
                long periodNs = site.settings().cycleMs() * 1_000_000L;
                if (e.get("periodNs").asLong() != periodNs) {
                    throw new ReplayRefused(recorded.file() + ":" + e.lineNumber() + ": cycle period "
                            + e.get("periodNs").asLong() + " ns, the site file's cycleMs gives " + periodNs + " ns");
                }
                clock.setEpochMillis(e.tMs());
                clock.setMonotonicNanos(e.get("t0Ns").asLong() - 1);
                agent.doWork();
            }
            case JournalFormat.KIND_DECIDED -> {
                clock.setEpochMillis(e.tMs());
                clock.setMonotonicNanos(e.get("pollNs").asLong());
                agent.doWork();
            }
            case JournalFormat.KIND_EVENT -> {
                return event(e, agent, bus, clock);
            }
            default -> {
                // an output: compared, not fed
            }
        }
        return false;
    }

    /** @return true when the event stopped the controller */
    private static boolean event(JournalEntry e, ControllerAgent agent, ReplayBus bus, ReplayClock clock) {
        String name = e.text("event");
        if ("busLinkDown".equals(name)) {
            bus.linkDown(e.text("cause"));
        } else if ("busConnected".equals(name) || "busReconnected".equals(name)) {
            bus.linkUp("busReconnected".equals(name));
        } else if ("summary".equals(name)) {
            clock.setEpochMillis(e.tMs());
            agent.onClose();
            return true;
        } else {
            return false; // decided by a cycle or an input: an output
        }
        clock.setEpochMillis(e.tMs());
        agent.drainArrivals();
        return false;
    }

    /** @return false when the journal's first link change brings the link up: it was down at the start */
    private boolean linkUpAtStart() {
        for (JournalEntry e : recorded.entries()) {
            String name = JournalFormat.KIND_EVENT.equals(e.kind()) ? e.text("event") : null;
            if ("busLinkDown".equals(name)) {
                return true;
            }
            if ("busConnected".equals(name) || "busReconnected".equals(name)) {
                return false;
            }
        }
        return true;
    }

    private Map<String, Object> headerExtras() {
        Map<String, Object> extras = new LinkedHashMap<>();
        for (Iterator<Map.Entry<String, JsonNode>> it = recorded.header().fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> f = it.next();
            if (!List.of("journal", "schemaVersion", "process", "startedAt").contains(f.getKey())) {
                extras.put(f.getKey(), f.getValue());
            }
        }
        return extras;
    }

    /** @return true for the events about the plant's clock ticks (silence), which a replay does not follow */
    private static boolean aboutTheTicks(JournalEntry e) {
        if (!JournalFormat.KIND_EVENT.equals(e.kind())) {
            return false;
        }
        String name = e.text("event");
        return "clockSilent".equals(name) || "clockHeard".equals(name);
    }

    private Result compare(Path replayedFile, long inputs) {
        List<JournalEntry> replayed = new ArrayList<>();
        JournalReader.stream(replayedFile, replayed::add).end().ifPresent(replayed::add);
        List<JournalEntry> rec = recorded.entries().stream().filter(e -> !aboutTheTicks(e)).toList();
        long decisions = 0;
        for (int i = 0; i < rec.size(); i++) {
            JournalEntry r = rec.get(i);
            JournalEntry p = i < replayed.size() ? replayed.get(i) : null;
            Divergence.Found d = p == null ? new Divergence.Found(Divergence.WHOLE_ENTRY, r.fields(), null)
                    : Divergence.firstDifference("", r.fields(), p.fields());
            if (d != null) {
                return new Result(decisions, i, inputs, new Divergence(i + 1, r.lineNumber(), r.tMs(), r.kind(), d.path(),
                        d.recordedText(), d.replayedText()));
            }
            if (JournalFormat.KIND_DECIDED.equals(r.kind())) {
                decisions++;
            }
        }
        return new Result(decisions, rec.size(), inputs, null);
    }
}
