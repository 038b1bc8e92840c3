package org.loopstand.report.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.OptionalDouble;
import java.util.function.Predicate;
import java.util.stream.Stream;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalSummary;
import org.loopstand.report.model.TimeSeries;

/**
 * A run folder ({@code runs/<timestamp>-<scenario>/}) read back: every Loopstand journal in it, by
 * process name, with helpers to pull time series out for the report. Files the rig did not write (a
 * controller's own log, notes, a foreign {@code .jsonl}) are skipped and listed, never a reason to fail.
 *
 * @param folder   the run folder
 * @param journals process name → contents, in file name order
 * @param skipped  one line per file that was not read, with why
 */
public record RunFolder(Path folder, Map<String, JournalReader.Contents> journals, List<String> skipped) {
    /** Files the rig writes into a run folder besides its journals, by name and by suffix. */
    private static final List<String> OWNED_NAMES = List.of("plant.log", "controller.log", "report.html");
    private static final List<String> OWNED_SUFFIXES = List.of(".hlog", ".csv");

    public RunFolder {
        journals = Collections.unmodifiableMap(new LinkedHashMap<>(journals));
        skipped = List.copyOf(skipped);
    }

    /**
     * Reads every Loopstand journal ({@code *.jsonl} with a Loopstand header) in the folder.
     *
     * @param folder a run folder
     * @return the journals, and the files skipped
     * @throws IllegalArgumentException when the folder holds no Loopstand journal
     */
    public static RunFolder read(Path folder) {
        Map<String, JournalReader.Contents> journals = new LinkedHashMap<>();
        List<String> skipped = new ArrayList<>();
        try (Stream<Path> files = Files.list(folder)) {
            for (Path p : files.sorted().toList()) {
                String name = p.getFileName().toString();
                if (!Files.isRegularFile(p)) {
                    continue; // e.g. the csv export folder
                }
                if (!name.endsWith(".jsonl")) {
                    if (!OWNED_NAMES.contains(name) && OWNED_SUFFIXES.stream().noneMatch(name::endsWith)) {
                        skipped.add(name + ": not a file the rig writes");
                    }
                    continue;
                }
                try {
                    JournalReader.Contents c = JournalReader.readAll(p);
                    if (c.summary().header().isEmpty()) {
                        skipped.add(name + ": not a Loopstand journal (its first line is not a journal header)");
                    } else {
                        journals.put(name.substring(0, name.length() - ".jsonl".length()), c);
                    }
                } catch (IllegalArgumentException e) {
                    skipped.add(name + ": not a Loopstand journal (" + e.getMessage() + ")");
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot list run folder " + folder + ": " + e.getMessage(), e);
        }
        if (journals.isEmpty()) {
            throw new IllegalArgumentException("run folder " + folder + " holds no Loopstand journal (*.jsonl)"
                    + (skipped.isEmpty() ? "" : "; skipped: " + String.join("; ", skipped)));
        }
        return new RunFolder(folder, journals, skipped);
    }

    /** Journal name prefix of a unit interface that ran as a process of its own ({@code unit --journal}). */
    public static final String UNIT_JOURNAL_PREFIX = "unit-";

    /**
     * The plant side of the run: the plant's journal with those of the unit interfaces that ran as
     * processes of their own ({@code unit-*.jsonl}, the same entry kinds), merged by entry time (stable:
     * entries of equal time keep the plant's first, then file name order).
     *
     * @return the merged entries; empty when there is no plant journal and no unit journal
     */
    public List<JournalEntry> plantSideEntries() {
        List<JournalEntry> all = new ArrayList<>();
        JournalReader.Contents plant = journals.get("plant");
        if (plant != null) {
            all.addAll(plant.entries());
        }
        boolean units = false;
        for (Map.Entry<String, JournalReader.Contents> j : journals.entrySet()) {
            if (j.getKey().startsWith(UNIT_JOURNAL_PREFIX)) {
                all.addAll(j.getValue().entries());
                units = true;
            }
        }
        if (units) {
            all.sort(java.util.Comparator.comparingLong(JournalEntry::tMs));
        }
        return all;
    }

    /** @return true when any journal lacks its end entry */
    public boolean cutShort() {
        return journals.values().stream().anyMatch(c -> c.summary().cutShort());
    }

    /** @return one line per journal that was cut short, torn or damaged; empty when all are clean */
    public List<String> problems() {
        List<String> out = new ArrayList<>();
        journals.forEach((name, c) -> {
            JournalSummary s = c.summary();
            if (s.cutShort() || s.tornTail() || !s.damagedLines().isEmpty()) {
                out.add(name + ".jsonl: " + s.describe());
            }
        });
        return out;
    }

    /** @return earliest header start time over the journals, epoch ms; −1 when none */
    public long startedAtMs() {
        return journals.values().stream().map(JournalReader.Contents::summary)
                .flatMap(s -> s.header().stream()).mapToLong(h -> h.path("startedAt").asLong(Long.MAX_VALUE))
                .min().orElse(-1);
    }

    /** @return latest entry time over the journals, epoch ms */
    public long endedAtMs() {
        return journals.values().stream().mapToLong(c -> c.summary().end().map(JournalEntry::tMs)
                .orElse(c.summary().lastEntryTimeMs())).max().orElse(-1);
    }

    /**
     * Pulls a numeric field out of one process's entries as a series.
     *
     * @param process journal name, e.g. {@code plant}
     * @param kind    entry kind, e.g. {@code truth}
     * @param filter  which entries of that kind (e.g. {@code e -> "north".equals(e.text("area"))})
     * @param field   numeric field, e.g. {@code frequencyHz}
     * @param name    series name
     * @param unit    series unit
     * @return the series; entries without the field are skipped
     */
    public TimeSeries series(String process, String kind, Predicate<JournalEntry> filter, String field, String name,
            String unit) {
        JournalReader.Contents c = journals.get(process);
        if (c == null) {
            throw new IllegalArgumentException("run " + folder + " has no journal '" + process + "' (has "
                    + journals.keySet() + ")");
        }
        List<JournalEntry> picked = c.entries().stream().filter(e -> e.kind().equals(kind)).filter(filter).toList();
        long[] t = new long[picked.size()];
        double[] v = new double[picked.size()];
        int n = 0;
        for (JournalEntry e : picked) {
            OptionalDouble x = e.number(field);
            if (x.isPresent()) {
                t[n] = e.tMs();
                v[n++] = x.getAsDouble();
            }
        }
        return new TimeSeries(name, unit, java.util.Arrays.copyOf(t, n), java.util.Arrays.copyOf(v, n));
    }
}
