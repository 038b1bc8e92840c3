package org.loopstand.plant.scenario;

import java.util.Optional;

import org.loopstand.plant.grid.Grid;

/** The events that act on the grid physics only. */
public final class PhysicsEvents {
    private PhysicsEvents() {
    }

    /** A frequency-independent load step in an area, MW (+ = more load). */
    public record LoadStep(double atS, String area, double deltaMw) implements ScenarioEvent {
        @Override
        public String type() {
            return "loadStep";
        }

        @Override
        public Optional<String> check(Grid grid) {
            return knownArea(grid, area);
        }

        @Override
        public void apply(ScenarioContext context) {
            context.grid().stepLoadMw(area, deltaMw);
        }
    }

    /** A linear load change over {@code durationS}, MW. */
    public record LoadRamp(double atS, String area, double deltaMw, double durationS) implements ScenarioEvent {
        @Override
        public String type() {
            return "loadRamp";
        }

        @Override
        public Optional<String> check(Grid grid) {
            if (!(durationS >= 0)) {
                return Optional.of("durationS must be 0 or more, got " + durationS);
            }
            return knownArea(grid, area);
        }

        @Override
        public void apply(ScenarioContext context) {
            context.grid().rampLoadMw(area, deltaMw, durationS);
        }
    }

    /** A unit trip: output decays to zero on the unit's trip time constant. */
    public record UnitTrip(double atS, String unit) implements ScenarioEvent {
        @Override
        public String type() {
            return "unitTrip";
        }

        @Override
        public Optional<String> check(Grid grid) {
            return knownUnit(grid, unit);
        }

        @Override
        public void apply(ScenarioContext context) {
            context.grid().trip(unit);
        }
    }

    /** Moves a unit's load reference at once (a setpoint straight to the governor), MW. */
    public record SetLoadReference(double atS, String unit, double mw) implements ScenarioEvent {
        @Override
        public String type() {
            return "setLoadReference";
        }

        @Override
        public Optional<String> check(Grid grid) {
            return knownUnit(grid, unit);
        }

        @Override
        public void apply(ScenarioContext context) {
            context.grid().setLoadReferenceMw(unit, mw);
        }
    }

    private static Optional<String> knownArea(Grid grid, String area) {
        return grid.hasArea(area) ? Optional.empty()
                : Optional.of("unknown area '" + area + "' (site " + grid.siteId() + " has "
                + grid.areas().stream().map(a -> a.id()).toList() + ")");
    }

    private static Optional<String> knownUnit(Grid grid, String unit) {
        return grid.hasUnit(unit) ? Optional.empty()
                : Optional.of("unknown unit '" + unit + "' (site " + grid.siteId() + " has "
                + grid.units().stream().map(u -> u.id()).toList() + ")");
    }
}
