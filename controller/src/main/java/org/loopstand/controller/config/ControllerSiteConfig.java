package org.loopstand.controller.config;

import java.util.List;
import java.util.Optional;

import org.loopstand.controller.schedule.AreaSchedule;

/**
 * The controller's view of a site: areas, ties, units and the controller settings. Built by
 * {@link ControllerSiteReader} or directly (tests).
 */
public record ControllerSiteConfig(String siteId, List<SiteArea> areas, List<SiteTie> ties, List<SiteUnit> units,
                                   ControllerSettings settings) {
    public ControllerSiteConfig {
        areas = List.copyOf(areas);
        ties = List.copyOf(ties);
        units = List.copyOf(units);
    }

    public Optional<SiteArea> area(String id) {
        return areas.stream().filter(a -> a.id().equals(id)).findFirst();
    }

    public Optional<SiteUnit> unit(String id) {
        return units.stream().filter(u -> u.id().equals(id)).findFirst();
    }

    /** @return the ties with {@code areaId} at one end, in file order */
    public List<SiteTie> tiesOf(String areaId) {
        return ties.stream().filter(t -> t.otherEnd(areaId) != null).toList();
    }

    /** @return the schedule implied by the site file: NIs = Σ scheduled tie exports, Fs = f0 */
    public AreaSchedule siteSchedule(String areaId) {
        SiteArea a = area(areaId).orElseThrow(() -> new IllegalArgumentException("no area " + areaId));
        double ni = 0;
        for (SiteTie t : tiesOf(areaId)) {
            ni += t.exportSign(areaId) * t.scheduledFlowMw();
        }
        return new AreaSchedule(ni, a.nominalFrequencyHz());
    }

    /** @return a copy with other controller settings */
    public ControllerSiteConfig withSettings(ControllerSettings s) {
        return new ControllerSiteConfig(siteId, areas, ties, units, s);
    }
}
