package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.loopstand.plant.grid.GeneratingUnit;

/**
 * How the units' plant interfaces share MQTT connections. Whatever the grouping, each unit keeps its
 * own logical link ({@link ControlCentreLink}) that a fault can take down alone.
 */
public enum ConnectionGrouping {
    /** One connection per unit, own client id and last will on the unit's link topic. */
    PER_UNIT,
    /** One connection per plant gateway; a gateway serves the units of one area. */
    PER_PLANT,
    /** A fixed pool of connections; units are dealt out round robin in site order. */
    POOLED;

    /** @return the grouping named as on the command line: per-unit, per-plant, pooled */
    public static ConnectionGrouping parse(String text) {
        return valueOf(text.trim().toUpperCase(Locale.ROOT).replace('-', '_'));
    }

    public String cliName() {
        return name().toLowerCase(Locale.ROOT).replace('_', '-');
    }

    /**
     * @param site     site id, part of every client id
     * @param units    units to place, in site order
     * @param poolSize connections for {@link #POOLED}, ≥ 1
     * @return client id → units it serves, in a stable order
     */
    public Map<String, List<String>> plan(String site, List<GeneratingUnit> units, int poolSize) {
        Map<String, List<String>> plan = new LinkedHashMap<>();
        for (int i = 0; i < units.size(); i++) {
            GeneratingUnit u = units.get(i);
            String client = switch (this) {
                case PER_UNIT -> site + "-unit-" + u.id();
                case PER_PLANT -> site + "-gateway-" + u.area();
                case POOLED -> site + "-pool-" + (i % Math.max(1, poolSize));
            };
            plan.computeIfAbsent(client, k -> new ArrayList<>()).add(u.id());
        }
        return plan;
    }
}
