package org.loopstand.plant.grid;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * A validated synchronous network: areas, the tie lines between them (any mesh), units and loads.
 * Immutable; build one with {@link GridBuilder}.
 */
public final class Grid {
    private final String siteId;
    private final List<Area> areas;
    private final List<TieLine> ties;
    private final List<GeneratingUnit> units;
    private final List<LoadModel> loads;
    private final Map<String, Integer> areaIndex;
    private final Map<String, Integer> tieIndex;
    private final Map<String, Integer> unitIndex;

    Grid(String siteId, List<Area> areas, List<TieLine> ties, List<GeneratingUnit> units, List<LoadModel> loads) {
        this.siteId = siteId;
        this.areas = List.copyOf(areas);
        this.ties = List.copyOf(ties);
        this.units = List.copyOf(units);
        this.loads = List.copyOf(loads);
        this.areaIndex = index(this.areas, Area::id);
        this.tieIndex = index(this.ties, TieLine::id);
        this.unitIndex = index(this.units, GeneratingUnit::id);
    }

    /**
     * The same grid with every load's random noise switched off (a quiet test bed, e.g. for a unit
     * response test: the frequency then moves only with what is tested); everything else unchanged.
     */
    public Grid withoutLoadNoise() {
        return new Grid(siteId, areas, ties, units, loads.stream().map(l -> new LoadModel(l.id(), l.area(), l.baseMw(),
                l.dailyShapePu(), 0.0, l.noiseTauS(), l.frequencySensitivityPctPerPct())).toList());
    }

    private static <T> Map<String, Integer> index(List<T> items, Function<T, String> id) {
        Map<String, Integer> map = new LinkedHashMap<>();
        for (int i = 0; i < items.size(); i++) {
            map.put(id.apply(items.get(i)), i);
        }
        return Map.copyOf(map);
    }

    public String siteId() {
        return siteId;
    }

    public List<Area> areas() {
        return areas;
    }

    public List<TieLine> ties() {
        return ties;
    }

    public List<GeneratingUnit> units() {
        return units;
    }

    public List<LoadModel> loads() {
        return loads;
    }

    /** @return position of the area in {@link #areas()}; IllegalArgumentException if unknown */
    public int areaIndex(String areaId) {
        return lookup(areaIndex, areaId, "area");
    }

    public int tieIndex(String tieId) {
        return lookup(tieIndex, tieId, "tie line");
    }

    public int unitIndex(String unitId) {
        return lookup(unitIndex, unitId, "unit");
    }

    public boolean hasArea(String areaId) {
        return areaIndex.containsKey(areaId);
    }

    public boolean hasUnit(String unitId) {
        return unitIndex.containsKey(unitId);
    }

    private static int lookup(Map<String, Integer> map, String id, String kind) {
        Integer i = map.get(id);
        if (i == null) {
            throw new IllegalArgumentException("unknown " + kind + " '" + id + "' (known: " + map.keySet() + ")");
        }
        return i;
    }

    /**
     * @param areaId an area of this grid
     * @return the area's scheduled net interchange from its ties' scheduled flows, MW, + = export
     */
    public double scheduledNetInterchangeMw(String areaId) {
        double mw = 0;
        for (TieLine t : ties) {
            mw += t.fromArea().equals(areaId) ? t.scheduledFlowMw() : t.toArea().equals(areaId) ? -t.scheduledFlowMw() : 0;
        }
        return mw;
    }
}
