package org.loopstand.plant.grid;

import org.loopstand.protocol.site.AceConvention;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Collects areas, ties, units and loads with defaults, then {@link #build()} checks everything at once
 * and either returns a {@link Grid} or throws a {@link GridValidationException} listing every problem.
 */
public final class GridBuilder {
    private final String siteId;
    private final List<AreaSpec> areas = new ArrayList<>();
    private final List<TieSpec> ties = new ArrayList<>();
    private final List<UnitSpec> units = new ArrayList<>();
    private final List<LoadSpec> loads = new ArrayList<>();

    public GridBuilder(String siteId) {
        this.siteId = siteId;
    }

    public AreaSpec area(String id) {
        AreaSpec a = new AreaSpec(id);
        areas.add(a);
        return a;
    }

    public TieSpec tie(String id, String fromArea, String toArea) {
        TieSpec t = new TieSpec(id, fromArea, toArea);
        ties.add(t);
        return t;
    }

    public UnitSpec unit(String id, String area) {
        UnitSpec u = new UnitSpec(id, area);
        units.add(u);
        return u;
    }

    public LoadSpec load(String id, String area) {
        LoadSpec l = new LoadSpec(id, area);
        loads.add(l);
        return l;
    }

    /** Validates everything and builds the network. */
    public Grid build() {
        List<GridProblem> problems = new ArrayList<>();
        if (siteId == null || siteId.isBlank()) {
            problems.add(new GridProblem("site", "siteId", "must not be empty"));
        }
        Map<String, AreaSpec> areaById = new LinkedHashMap<>();
        if (areas.isEmpty()) {
            problems.add(new GridProblem("site", "areas", "at least one area is needed"));
        }
        for (AreaSpec a : areas) {
            a.check(problems);
            if (areaById.putIfAbsent(a.id, a) != null) {
                problems.add(new GridProblem("area " + a.id, "id", "the id is used by another area"));
            }
        }
        Set<String> tieIds = new HashSet<>();
        for (TieSpec t : ties) {
            t.check(problems, areaById);
            if (!tieIds.add(t.id)) {
                problems.add(new GridProblem("tie " + t.id, "id", "the id is used by another tie line"));
            }
        }
        Set<String> unitIds = new HashSet<>();
        for (UnitSpec u : units) {
            u.check(problems, areaById.keySet());
            if (!unitIds.add(u.id)) {
                problems.add(new GridProblem("unit " + u.id, "id", "the id is used by another unit"));
            }
        }
        Set<String> loadIds = new HashSet<>();
        for (LoadSpec l : loads) {
            l.check(problems, areaById.keySet());
            if (!loadIds.add(l.id)) {
                problems.add(new GridProblem("load " + l.id, "id", "the id is used by another load"));
            }
        }
        if (!problems.isEmpty()) {
            throw new GridValidationException(problems);
        }
        return new Grid(siteId,
                areas.stream().map(AreaSpec::toArea).toList(),
                ties.stream().map(TieSpec::toTie).toList(),
                units.stream().map(UnitSpec::toUnit).toList(),
                loads.stream().map(LoadSpec::toLoad).toList());
    }

    static void positive(List<GridProblem> p, String subject, String field, double v, String unit) {
        if (!(v > 0) || Double.isNaN(v)) {
            p.add(new GridProblem(subject, field, "must be greater than 0 " + unit + ", got " + v));
        }
    }

    static void nonNegative(List<GridProblem> p, String subject, String field, double v, String unit) {
        if (!(v >= 0)) {
            p.add(new GridProblem(subject, field, "must be 0 or more " + unit + ", got " + v));
        }
    }

    /** An area under construction. Defaults: 50 Hz, damping 0, European convention without K. */
    public static final class AreaSpec {
        private final String id;
        private double nominalFrequencyHz = 50;
        private double ratingMva = Double.NaN;
        private double inertiaS = Double.NaN;
        private double dampingMwPerHz;
        private AceConvention aceConvention = AceConvention.EUROPEAN;
        private double biasMwPer01Hz = Double.NaN;
        private double kMwPerHz = Double.NaN;

        AreaSpec(String id) {
            this.id = id;
        }

        public AreaSpec nominalFrequencyHz(double v) { nominalFrequencyHz = v; return this; }
        public AreaSpec ratingMva(double v) { ratingMva = v; return this; }
        public AreaSpec inertiaS(double v) { inertiaS = v; return this; }
        public AreaSpec dampingMwPerHz(double v) { dampingMwPerHz = v; return this; }
        public AreaSpec aceConvention(AceConvention v) { aceConvention = v; return this; }
        public AreaSpec biasMwPer01Hz(double v) { biasMwPer01Hz = v; return this; }
        public AreaSpec kMwPerHz(double v) { kMwPerHz = v; return this; }

        void check(List<GridProblem> p) {
            String s = "area " + id;
            if (id == null || id.isBlank()) {
                p.add(new GridProblem("area", "id", "must not be empty"));
            }
            if (nominalFrequencyHz != 50 && nominalFrequencyHz != 60) {
                p.add(new GridProblem(s, "nominalFrequencyHz", "must be 50 or 60, got " + nominalFrequencyHz));
            }
            positive(p, s, "ratingMva", ratingMva, "MVA");
            positive(p, s, "inertiaS", inertiaS, "s");
            nonNegative(p, s, "dampingMwPerHz", dampingMwPerHz, "MW/Hz");
            if (!Double.isNaN(biasMwPer01Hz) && !(biasMwPer01Hz < 0)) {
                p.add(new GridProblem(s, "biasMwPer01Hz", "must be negative (MW/0.1 Hz, North-American sign), got " + biasMwPer01Hz));
            }
            if (!Double.isNaN(kMwPerHz) && !(kMwPerHz > 0)) {
                p.add(new GridProblem(s, "kMwPerHz", "must be positive (MW/Hz), got " + kMwPerHz));
            }
            if (aceConvention == AceConvention.NORTH_AMERICAN && Double.isNaN(biasMwPer01Hz)) {
                p.add(new GridProblem(s, "biasMwPer01Hz", "is needed for the North-American ACE convention"));
            }
            if (aceConvention == AceConvention.EUROPEAN && Double.isNaN(kMwPerHz)) {
                p.add(new GridProblem(s, "kMwPerHz", "is needed for the European ACE convention"));
            }
        }

        Area toArea() {
            return new Area(id, nominalFrequencyHz, ratingMva, inertiaS, dampingMwPerHz, aceConvention,
                    biasMwPer01Hz, kMwPerHz);
        }
    }

    /** A tie line under construction: give T directly or via reactance and the initial angle. */
    public static final class TieSpec {
        private final String id;
        private final String fromArea;
        private final String toArea;
        private double synchronizingMwPerRad = Double.NaN;
        private double scheduledFlowMw;

        TieSpec(String id, String fromArea, String toArea) {
            this.id = id;
            this.fromArea = fromArea;
            this.toArea = toArea;
        }

        public TieSpec synchronizingMwPerRad(double v) { synchronizingMwPerRad = v; return this; }

        /**
         * T = (V²/X)·cos(δ0)·S with both voltages at 1 pu.
         *
         * @param reactancePu        series reactance on {@code baseMva}, &gt; 0
         * @param initialAngleDiffDeg angle difference across the tie at the operating point, |δ0| &lt; 90°
         */
        public TieSpec fromReactance(double reactancePu, double baseMva, double initialAngleDiffDeg) {
            synchronizingMwPerRad = Math.cos(Math.toRadians(initialAngleDiffDeg)) / reactancePu * baseMva;
            return this;
        }

        public TieSpec scheduledFlowMw(double v) { scheduledFlowMw = v; return this; }

        void check(List<GridProblem> p, Map<String, AreaSpec> areas) {
            String s = "tie " + id;
            AreaSpec from = areas.get(fromArea);
            AreaSpec to = areas.get(toArea);
            if (from == null) {
                p.add(new GridProblem(s, "fromArea", "unknown area '" + fromArea + "' (known: " + areas.keySet() + ")"));
            }
            if (to == null) {
                p.add(new GridProblem(s, "toArea", "unknown area '" + toArea + "' (known: " + areas.keySet() + ")"));
            }
            if (fromArea != null && fromArea.equals(toArea)) {
                p.add(new GridProblem(s, "toArea", "a tie must join two different areas"));
            }
            if (from != null && to != null && from.nominalFrequencyHz != to.nominalFrequencyHz) {
                p.add(new GridProblem(s, "toArea", "joins a " + from.nominalFrequencyHz + " Hz area to a "
                        + to.nominalFrequencyHz + " Hz area; a synchronous tie needs one frequency"));
            }
            positive(p, s, "synchronizingMwPerRad", synchronizingMwPerRad, "MW/rad");
            if (!Double.isFinite(scheduledFlowMw)) {
                p.add(new GridProblem(s, "scheduledFlowMw", "must be a finite number"));
            }
        }

        TieLine toTie() {
            return new TieLine(id, fromArea, toArea, synchronizingMwPerRad, scheduledFlowMw);
        }
    }

    /** A load under construction. Defaults: flat shape, no noise, no frequency dependence. */
    public static final class LoadSpec {
        private final String id;
        private final String area;
        private double baseMw = Double.NaN;
        private List<Double> dailyShapePu = List.of();
        private double noiseSigmaMw;
        private double noiseTauS = 60;
        private double frequencySensitivityPctPerPct;

        LoadSpec(String id, String area) {
            this.id = id;
            this.area = area;
        }

        public LoadSpec baseMw(double v) { baseMw = v; return this; }
        public LoadSpec dailyShapePu(List<Double> v) { dailyShapePu = List.copyOf(v); return this; }
        public LoadSpec noise(double sigmaMw, double tauS) { noiseSigmaMw = sigmaMw; noiseTauS = tauS; return this; }
        public LoadSpec frequencySensitivityPctPerPct(double v) { frequencySensitivityPctPerPct = v; return this; }

        void check(List<GridProblem> p, Set<String> areas) {
            String s = "load " + id;
            if (!areas.contains(area)) {
                p.add(new GridProblem(s, "area", "unknown area '" + area + "' (known: " + areas + ")"));
            }
            nonNegative(p, s, "baseMw", baseMw, "MW");
            if (!dailyShapePu.isEmpty() && dailyShapePu.size() != 24) {
                p.add(new GridProblem(s, "dailyShapePu", "needs 24 hourly factors, got " + dailyShapePu.size()));
            }
            for (double f : dailyShapePu) {
                if (!(f >= 0)) {
                    p.add(new GridProblem(s, "dailyShapePu", "factors must be 0 or more, got " + f));
                }
            }
            nonNegative(p, s, "noiseSigmaMw", noiseSigmaMw, "MW");
            if (noiseSigmaMw > 0) {
                positive(p, s, "noiseTauS", noiseTauS, "s");
            }
            nonNegative(p, s, "frequencySensitivityPctPerPct", frequencySensitivityPctPerPct, "%/%");
        }

        LoadModel toLoad() {
            return new LoadModel(id, area, baseMw, dailyShapePu, noiseSigmaMw, noiseTauS, frequencySensitivityPctPerPct);
        }
    }
}
