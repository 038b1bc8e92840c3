package org.loopstand.plant.journal;

import java.util.LinkedHashMap;
import java.util.Map;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.unit.CommandFate;
import org.loopstand.protocol.message.ControllerStatus;

/**
 * The fields of the plant journal's larger entries ({@code truth}, {@code command}, {@code controllerStatus},
 * {@code check}), built apart from {@link PlantRunJournal}, which only writes them. Names and units are the
 * journal's (docs/report.md).
 */
final class PlantEntryFields {
    private PlantEntryFields() {
    }

    /** The physics as it is: every area, tie and unit. */
    static Map<String, Object> truth(GridSimulator sim, Map<String, String> controlModes) {
        Grid g = sim.grid();
        Map<String, Object> areas = new LinkedHashMap<>();
        for (int i = 0; i < g.areas().size(); i++) {
            Area a = g.areas().get(i);
            areas.put(a.id(), Map.of("frequencyHz", round(sim.frequencyHz(i), 1e6), "loadMw", round(sim.loadMw(i), 1e3),
                    "netInterchangeMw", round(sim.netInterchangeMw(i), 1e3)));
        }
        Map<String, Object> ties = new LinkedHashMap<>();
        for (int i = 0; i < g.ties().size(); i++) {
            TieLine t = g.ties().get(i);
            ties.put(t.id(), Map.of("flowMw", round(sim.tieFlowMw(i), 1e3)));
        }
        Map<String, Object> units = new LinkedHashMap<>();
        for (int i = 0; i < g.units().size(); i++) {
            GeneratingUnit u = g.units().get(i);
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("outputMw", round(sim.outputMw(i), 1e3));
            m.put("loadReferenceMw", round(sim.loadReferenceMw(i), 1e3));
            m.put("online", sim.isOnline(u.id()));
            m.put("controlMode", controlModes.getOrDefault(u.id(), "elsewhere"));
            units.put(u.id(), m);
        }
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("timeS", round(sim.timeS(), 1e3));
        f.put("areas", areas);
        f.put("ties", ties);
        f.put("units", units);
        return f;
    }

    /** What became of one command at a unit, with the load reference before and after. */
    static Map<String, Object> command(CommandFate fate) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("unit", fate.unit());
        f.put("commandSeq", fate.commandSeq());
        f.put("controllerId", fate.controllerId());
        if (fate.kind() != null) {
            f.put("commandKind", fate.kind());
        }
        if (fate.direction() != null) {
            f.put("direction", fate.direction());
            f.put("durationMs", fate.durationMs());
        }
        if (fate.setpointMw() != null) {
            f.put("setpointMw", fate.setpointMw());
        }
        f.put("validUntil", fate.validUntil());
        if (fate.issuedAt() > 0) {
            f.put("issuedAt", fate.issuedAt());
            f.put("epoch", fate.epoch());
        }
        f.put("outcome", fate.outcome());
        if (fate.reason() != null) {
            f.put("reason", fate.reason());
        }
        if (fate.detail() != null) {
            f.put("detail", fate.detail());
        }
        putFinite(f, "loadReferenceBeforeMw", fate.loadReferenceBeforeMw());
        putFinite(f, "loadReferenceAfterMw", fate.loadReferenceAfterMw());
        return f;
    }

    /** A controller status as the plant received it: state, reasons, ACE per area, exclusions, suspensions. */
    static Map<String, Object> controllerStatus(ControllerStatus s) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("controllerId", s.controllerId());
        f.put("seq", s.seq());
        f.put("sourceTime", s.sourceTime());
        f.put("epoch", s.epoch());
        f.put("state", s.state().wireName());
        if (!s.reasons().isEmpty()) {
            f.put("reasons", s.reasons());
        }
        f.put("cycle", s.cycle());
        Map<String, Object> areas = new LinkedHashMap<>();
        s.areas().forEach(a -> areas.put(a.area(), Map.of("aceMw", a.aceMw(), "filteredAceMw", a.filteredAceMw(), "band", a.band())));
        f.put("areas", areas);
        if (s.excludedUnits() != null) {
            f.put("excludedUnits", s.excludedUnits().stream().map(x -> Map.of("unit", x.unit(), "area", x.area() == null ? "" : x.area(),
                    "reason", x.reason() == null ? "" : x.reason(), "shortfallMw", x.shortfallMw())).toList());
        }
        if (s.suspendedAreas() != null) {
            f.put("suspendedAreas", s.suspendedAreas().stream().map(x -> Map.of("area", x.area(), "reasons", x.reasons(),
                    "detail", x.detail() == null ? "" : x.detail(), "since", x.since())).toList());
        }
        return f;
    }

    /** A scenario check as decided at the end of the run: the report's pass/fail table reads these. */
    static Map<String, Object> check(CheckOutcome o) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("name", o.name());
        f.put("passed", o.passed());
        f.put("decidingFigure", Double.isNaN(o.decidingFigure()) ? "n/a" : fmt(o.decidingFigure()) + " " + o.unit());
        f.put("limit", fmt(o.limit()) + " " + o.unit());
        f.put("source", o.detail() + (o.controllerSide() ? " [controller side]" : ""));
        f.put("figure", Double.isNaN(o.decidingFigure()) ? null : o.decidingFigure());
        f.put("unit", o.unit());
        return f;
    }

    private static String fmt(double v) {
        return Double.isNaN(v) ? "n/a" : v == Math.rint(v) && Math.abs(v) < 1e12 ? Long.toString((long) v)
                : String.format(java.util.Locale.ROOT, "%.3f", v);
    }
    private static void putFinite(Map<String, Object> f, String name, double v) {
        if (Double.isFinite(v)) {
            f.put(name, v);
        }
    }

    private static double round(double v, double scale) {
        return Double.isFinite(v) ? Math.rint(v * scale) / scale : v;
    }
}
