package org.loopstand.controller.config;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.loopstand.protocol.site.AceConvention;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.cycle.AreaSchedule;
import org.loopstand.controller.cycle.AreaSetup;
import org.loopstand.controller.cycle.ControlCycleSettings;
import org.loopstand.controller.dispatch.QuadraticCostUnit;
import org.loopstand.controller.following.GovernorResponse;

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

    /** @return the cycle settings these areas, units and settings describe */
    public ControlCycleSettings toCycleSettings() {
        ControllerSettings s = settings;
        List<AreaSetup> setups = new ArrayList<>();
        Map<String, GovernorResponse> primary = new HashMap<>();
        for (SiteArea a : areas) {
            AreaControlSettings.Builder b = AreaControlSettings.builder(a.id()).mode(s.aceMode())
                    .nominalFrequencyHz(a.nominalFrequencyHz());
            if (a.convention() == AceConvention.NORTH_AMERICAN) {
                b.northAmericanBias(a.bias());
            } else {
                b.europeanK(a.bias());
            }
            List<QuadraticCostUnit> costs = new ArrayList<>();
            for (SiteUnit u : units) {
                if (u.area().equals(a.id())) {
                    if (u.costC() > 0) {
                        costs.add(new QuadraticCostUnit(u.id(), u.costA(), u.costB(), u.costC(), u.minMw(), u.maxMw()));
                    }
                    primary.put(u.id(), u.governor(a.nominalFrequencyHz()));
                }
            }
            long redispatch = costs.isEmpty() ? 0 : s.redispatchPeriodMs();
            setups.add(new AreaSetup(b.build(), s.regulation(), costs, redispatch, s.redispatchRampShare()));
        }
        return new ControlCycleSettings(s.cycleMs(), setups, s.pulses(), s.interlock(), s.following(),
                s.commandSettleMs(), primary);
    }
}
