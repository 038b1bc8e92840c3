package org.loopstand.plant.scenario;

import java.util.Locale;
import java.util.Optional;

import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.message.ControlMode;

/**
 * Events that act on the plant on the bus rather than the physics. In a run without a plant (physics
 * only) they change nothing but the run record (a schedule change still moves what the checks judge
 * against).
 */
public final class PlantEvents {
    private PlantEvents() {
    }

    /** A new schedule for an area: the plant publishes it retained on {@code …/area/{area}/schedule}; the checks use it. */
    public record ScheduleChange(double atS, String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz)
            implements ScenarioEvent {
        @Override
        public String type() {
            return "scheduleChange";
        }

        @Override
        public Optional<String> check(Grid grid) {
            if (!grid.hasArea(area)) {
                return Optional.of("unknown area '" + area + "' (site " + grid.siteId() + " has "
                        + grid.areas().stream().map(a -> a.id()).toList() + ")");
            }
            if (!(scheduledFrequencyHz >= 40 && scheduledFrequencyHz <= 70)) {
                return Optional.of("scheduledFrequencyHz must be in [40, 70] Hz, got " + scheduledFrequencyHz);
            }
            if (!Double.isFinite(scheduledNetInterchangeMw)) {
                return Optional.of("scheduledNetInterchangeMw must be a finite number of MW");
            }
            return Optional.empty();
        }

        @Override
        public void apply(ScenarioContext context) {
            context.scheduleChanged(area, scheduledNetInterchangeMw, scheduledFrequencyHz);
            PlantControls plant = context.plant();
            if (plant != null) {
                plant.publishSchedule(area, scheduledNetInterchangeMw, scheduledFrequencyHz);
            }
        }
    }

    /** A unit's control mode set at the plant (remote, local, off), as an operator there would. */
    public record ModeChange(double atS, String unit, ControlMode mode) implements ScenarioEvent {
        @Override
        public String type() {
            return "modeChange";
        }

        @Override
        public Optional<String> check(Grid grid) {
            return grid.hasUnit(unit) ? Optional.empty()
                    : Optional.of("unknown unit '" + unit + "' (site " + grid.siteId() + " has "
                    + grid.units().stream().map(u -> u.id()).toList() + ")");
        }

        @Override
        public void apply(ScenarioContext context) {
            PlantControls plant = context.plant();
            if (plant != null) {
                plant.setControlMode(unit, mode, "scenario event at " + atS + " s");
            }
        }
    }

    /** Reads {@code scheduleChange}: area, scheduledNetInterchangeMw, scheduledFrequencyHz (default 50). */
    static ScenarioEvent parseScheduleChange(double atS, MappingReader k) {
        return new ScheduleChange(atS, k.requiredString("area"), k.requiredDouble("scheduledNetInterchangeMw"),
                k.optionalDouble("scheduledFrequencyHz", 50.0));
    }

    /** Reads {@code modeChange}: unit, mode (remote | local | off). */
    static ScenarioEvent parseModeChange(double atS, MappingReader k) {
        String unit = k.requiredString("unit");
        String text = k.requiredString("mode");
        ControlMode mode = ControlMode.REMOTE;
        if (text != null) {
            try {
                mode = ControlMode.valueOf(text.toUpperCase(Locale.ROOT));
            } catch (IllegalArgumentException e) {
                k.fail("mode", "must be remote, local or off, got '" + text + "'");
            }
        }
        return new ModeChange(atS, unit, mode);
    }
}
