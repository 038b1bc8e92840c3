package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.MissingNode;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;

/**
 * The report's notes on what the plant decided about the run as a whole, each with its reason code and
 * figures from the plant journal: an early stop (and the checks it left undecided), and the pace keeper's
 * command-path watch stopped because the commands' age did not follow the rate.
 */
final class PlantDecisionNotes {
    private PlantDecisionNotes() {
    }

    static List<String> of(RunFolder run) {
        List<String> notes = new ArrayList<>();
        JournalReader.Contents plant = run.journals().get("plant");
        if (plant == null) {
            return notes;
        }
        JournalEntry notDecided = null;
        for (JournalEntry e : plant.entries()) {
            String event = e.kind().equals("event") ? e.text("event") : null;
            if ("paceWatchStopped".equals(event)) {
                notes.add(watchStopped(e));
            } else if (notDecided == null && "checksNotDecided".equals(event)) {
                notDecided = e;
            }
        }
        JournalEntry undecided = notDecided;
        plant.summary().endReason().filter(r -> r == EndReason.STOPPED).ifPresent(r -> notes.add(stopped(plant, undecided)));
        return notes;
    }

    private static String watchStopped(JournalEntry e) {
        return String.format(Locale.ROOT, "The plant's command-path watch stopped at %.1f s of scenario time (reason %s):"
                        + " a command %.1f s old made it cut the rate from %sx to %sx, and the next %d commands were still at"
                        + " least %.1f s old, so their age is in their own stamps (a controller clock behind the plant's, or"
                        + " back-dated commands), not on the way; the rate went back to %sx and the commands were judged as"
                        + " they came.", e.get("atS").asDouble(), e.text("reason"), e.get("cutAgeS").asDouble(),
                rate(e.get("cutFromRate")), rate(e.get("cutToRate")), e.get("commandsAfter").asInt(),
                e.get("youngestAgeAfterS").asDouble(), rate(e.get("toRate")));
    }

    private static String rate(JsonNode n) {
        double v = n.asDouble();
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }

    /**
     * The plant's early stop, with the time and the checks it left undecided when its journal says so
     * ({@code notDecided}, its first checksNotDecided event, or null).
     */
    private static String stopped(JournalReader.Contents plant, JournalEntry notDecided) {
        return java.util.Optional.ofNullable(notDecided).map(e -> {
            List<String> names = new ArrayList<>();
            e.get("checks").forEach(n -> names.add(n.asText()));
            JsonNode durationS = plant.summary().header().map(h -> h.path("scenarioDurationS"))
                    .orElse(MissingNode.getInstance());
            return String.format(Locale.ROOT, "The plant was stopped before the scenario's end, at %.1f s%s"
                            + " (journal end reason: stopped): its checks %s were not decided (checksNotDecided,"
                            + " reason %s).", e.get("stoppedAtS").asDouble(),
                    durationS.isNumber() ? String.format(Locale.ROOT, " of %.0f s", durationS.asDouble()) : "",
                    String.join(", ", names), e.text("reason"));
        }).orElse("The plant was stopped before the scenario's end (journal end reason: stopped).");
    }
}
