package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;

/**
 * The ids a fault may name at one site: areas, ties (as meter points), units and connections. Used
 * by the scenario loader, the live fault order handler and the command line alike.
 */
public final class TargetCatalog {
    /** Connection id of the plant process's own bus connection (the one carrying the area meters). */
    public static final String PLANT_CONNECTION = "plant";

    private final String siteId;
    private final Set<String> areas;
    private final Set<String> ties;
    private final Set<String> units;
    private final List<TieLine> tieLines;
    private final java.util.Map<String, Double> nominalHz = new java.util.HashMap<>();
    private Set<String> hosts = Set.of();

    private TargetCatalog(String siteId, Set<String> areas, List<TieLine> tieLines, Set<String> units) {
        this.siteId = siteId;
        this.areas = java.util.Collections.unmodifiableSet(new LinkedHashSet<>(areas));
        this.tieLines = List.copyOf(tieLines);
        Set<String> t = new LinkedHashSet<>();
        tieLines.forEach(l -> t.add(l.id()));
        this.ties = t;
        this.units = units;
    }

    public static TargetCatalog of(Grid grid) {
        Set<String> a = new LinkedHashSet<>();
        grid.areas().stream().map(Area::id).forEach(a::add);
        Set<String> u = new LinkedHashSet<>();
        grid.units().stream().map(GeneratingUnit::id).forEach(u::add);
        TargetCatalog c = new TargetCatalog(grid.siteId(), a, grid.ties(), u);
        grid.areas().forEach(area -> c.nominalHz.put(area.id(), area.nominalFrequencyHz()));
        return c;
    }

    /** @return this catalog with the host names network faults may name (from the run's {@link HostLinks}) */
    public TargetCatalog withHosts(Set<String> hostNames) {
        TargetCatalog c = new TargetCatalog(siteId, areas, tieLines, units);
        c.nominalHz.putAll(nominalHz);
        c.hosts = java.util.Collections.unmodifiableSet(new LinkedHashSet<>(hostNames));
        return c;
    }

    public String siteId() {
        return siteId;
    }

    /**
     * @param id      a target id as written in a scenario or fault order
     * @param allowed the kinds the fault type accepts
     * @return the target, or why the id does not fit
     */
    public Resolution resolve(String id, Set<TargetKind> allowed) {
        List<TargetKind> matches = new ArrayList<>();
        if (areas.contains(id)) {
            matches.add(TargetKind.AREA);
        }
        if (units.contains(id)) {
            matches.add(allowed.contains(TargetKind.CONNECTION) && !allowed.contains(TargetKind.UNIT)
                    ? TargetKind.CONNECTION : TargetKind.UNIT);
        }
        if (PLANT_CONNECTION.equals(id)) {
            matches.add(TargetKind.CONNECTION);
        }
        if (hosts.contains(id)) {
            matches.add(TargetKind.HOST);
        }
        matches.removeIf(k -> !allowed.contains(k));
        if (matches.size() == 1) {
            return new Resolution(Optional.of(new FaultTarget(matches.get(0), id)), null);
        }
        if (matches.size() > 1) {
            return new Resolution(Optional.empty(), "target '" + id + "' is ambiguous: it names " + matches);
        }
        if (allowed.contains(TargetKind.HOST)) {
            return new Resolution(Optional.empty(), "unknown host '" + id + "' (the run's hosts file names "
                    + (hosts.isEmpty() ? "none: give the plant --hosts FILE" : hosts) + ")");
        }
        return new Resolution(Optional.empty(), "unknown target '" + id + "' for this fault type (it takes "
                + kindsText(allowed) + "; site " + siteId + " has areas " + areas + ", units " + units
                + (allowed.contains(TargetKind.CONNECTION) ? ", connections [" + PLANT_CONNECTION + ", <unit ids>]" : "")
                + ")");
    }

    /** @return whether {@code tie} is a tie line touching {@code area} */
    public boolean tieTouches(String tie, String area) {
        return tieLines.stream().anyMatch(l -> l.id().equals(tie) && (l.fromArea().equals(area) || l.toArea().equals(area)));
    }

    /** @return the area's nominal frequency, Hz (50 if the area is unknown) */
    public double nominalHz(String area) {
        return nominalHz.getOrDefault(area, 50.0);
    }

    public Set<String> ties() {
        return ties;
    }

    public Set<String> areas() {
        return areas;
    }

    public Set<String> units() {
        return units;
    }

    private static String kindsText(Set<TargetKind> kinds) {
        return kinds.stream().sorted().map(TargetKind::wireName).toList().toString();
    }

    /** Either a target or a reason. */
    public record Resolution(Optional<FaultTarget> target, String problem) {
    }
}
