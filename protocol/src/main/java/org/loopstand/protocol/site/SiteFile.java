package org.loopstand.protocol.site;

import java.util.List;
import java.util.Optional;

import org.loopstand.protocol.config.KeyLocations;
import org.loopstand.protocol.config.YamlNode;

/**
 * One site file as written (keys and units: docs/physics.md), typed and with the place of every key,
 * read by {@link SiteReader}. The plant builds its grid from it, the controller its control view, the
 * pulse test one unit's declared figures. A number that is absent and has no default in the format
 * is NaN.
 *
 * @param siteId     the site's id, the root of its topics
 * @param controller the controller's own section, read by the controller, if written
 */
public record SiteFile(String siteId, String description, List<Area> areas, List<Tie> ties, List<Unit> units,
        List<Load> loads, Optional<YamlNode> controller, KeyLocations where) {
    public SiteFile {
        areas = List.copyOf(areas);
        ties = List.copyOf(ties);
        units = List.copyOf(units);
        loads = List.copyOf(loads);
    }

    /** @return the area with this id, if written */
    public Optional<Area> area(String id) {
        return areas.stream().filter(a -> a.id().equals(id)).findFirst();
    }

    /** @return the unit with this id, if written */
    public Optional<Unit> unit(String id) {
        return units.stream().filter(u -> u.id().equals(id)).findFirst();
    }

    /**
     * A control area.
     *
     * @param biasMwPer01Hz the North American bias B (negative, MW/0.1 Hz), NaN when not written
     * @param kMwPerHz      the European K (positive, MW/Hz), NaN when not written
     */
    public record Area(String id, double nominalFrequencyHz, double ratingMva, double inertiaS, double dampingMwPerHz,
            double biasMwPer01Hz, double kMwPerHz, AceConvention aceConvention, KeyLocations where) {
    }

    /**
     * A tie line: either {@code synchronizingMwPerRad} or {@code reactancePu} with {@code baseMva}
     * (and {@code initialAngleDiffDeg}, default 0) is written; the others are NaN.
     */
    public record Tie(String id, String fromArea, String toArea, double scheduledFlowMw, double synchronizingMwPerRad,
            double reactancePu, double baseMva, double initialAngleDiffDeg, KeyLocations where) {
        /** @return true when the tie is given by its synchronizing coefficient, false when by its reactance */
        public boolean direct() {
            return !Double.isNaN(synchronizingMwPerRad);
        }
    }

    /**
     * A generating unit. Output and regulating limits, initial output, ramp and pulse rates are NaN when
     * not written (the plant then derives them, docs/physics.md).
     */
    public record Unit(String id, String areaId, double ratingMw, double droopPct, double governorTimeConstantS,
            double deadBandHz, double raiseRateMwPerMin, double lowerRateMwPerMin, boolean online,
            double tripTimeConstantS, boolean acceptsSetpoints, Cost cost, Limits limits, Turbine turbine,
            KeyLocations where) {
    }

    /** Fuel cost {@code a + b·P + c·P²} in money/h with P in MW; 0 when not written. */
    public record Cost(double a, double b, double c) {
    }

    /** A unit's output and regulating limits, rates and first output, MW and MW/min; NaN when not written. */
    public record Limits(double minOutputMw, double maxOutputMw, double initialOutputMw, double regulatingMinMw,
            double regulatingMaxMw, double rampMwPerMin, double pulseRateMwPerMin) {
        /** @return regulatingMinMw, else minOutputMw, else {@code fallback} */
        public double regulatingLowMw(double fallback) {
            return !Double.isNaN(regulatingMinMw) ? regulatingMinMw : !Double.isNaN(minOutputMw) ? minOutputMw : fallback;
        }

        /** @return regulatingMaxMw, else maxOutputMw, else {@code fallback} */
        public double regulatingHighMw(double fallback) {
            return !Double.isNaN(regulatingMaxMw) ? regulatingMaxMw : !Double.isNaN(maxOutputMw) ? maxOutputMw : fallback;
        }
    }

    /**
     * The turbine model and its figures; those of other kinds, and those not written, are NaN.
     *
     * @param kind null when not written or not one of the known kinds (already refused)
     */
    public record Turbine(TurbineKind kind, double turbineTimeConstantS, double steamChestTimeConstantS,
            double reheatTimeConstantS, double hpFraction, double waterStartingTimeS, double transientDroopPct,
            double resetTimeS) {
    }

    /** A load: base demand, 24 hourly factors of it (empty: flat), noise and frequency sensitivity. */
    public record Load(String id, String areaId, double baseMw, List<Double> dailyShapePu, double noiseSigmaMw,
            double noiseTauS, double frequencySensitivityPctPerPct, KeyLocations where) {
        public Load {
            dailyShapePu = List.copyOf(dailyShapePu);
        }
    }
}
