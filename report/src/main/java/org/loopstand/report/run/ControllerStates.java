package org.loopstand.report.run;

import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.TimeSeries;

/** The controller's state over the run as the plant received it (its retained status on the bus). */
final class ControllerStates {
    private ControllerStates() {
    }

    /** @return a step chart per controller id (1 regulating, 0 suspended, −1 off or offline), or null without statuses */
    static Chart chart(List<JournalEntry> plant) {
        Map<String, TimeSeries> byId = new TreeMap<>();
        List<JournalEntry> statuses = JournalSeries.ofKind(plant, "controllerStatus");
        for (String id : statuses.stream().map(e -> e.text("controllerId")).filter(java.util.Objects::nonNull).distinct().toList()) {
            byId.put(id, JournalSeries.series(statuses, e -> id.equals(e.text("controllerId")), e -> code(e.text("state")),
                    id + " state", ""));
        }
        return byId.isEmpty() ? null : new Chart("Controller state as the plant saw it (1 regulating, 0 suspended, −1 off or offline)",
                "state", List.copyOf(byId.values()), true);
    }

    static double code(String state) {
        return "regulating".equals(state) ? 1.0 : "suspended".equals(state) ? 0.0 : -1.0;
    }
}
