package org.loopstand.controller.cycle;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.config.ControllerSettings;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.SiteArea;
import org.loopstand.controller.config.SiteUnit;
import org.loopstand.controller.dispatch.QuadraticCostUnit;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.config.InterlockSettings;
import org.loopstand.protocol.site.AceConvention;

/**
 * @param cycleMs          control cycle, ms, in [500, 60000] (default 4000); each area's
 *                         regulation cycleS must equal cycleMs/1000
 * @param areas            the areas, ids unique, at least one
 * @param pulses           pulse sizing
 * @param interlock        suspension rules
 * @param following        unit-following check
 * @param commandSettleMs  the reported setpoint is trusted only from telemetry stamped at least this
 *                         long after the end of the last command to the unit, ms, ≥ 0 (default
 *                         500); until then the commanded setpoint is used, so a lagging report
 *                         cannot make the cycle send the same move twice
 * @param governors        per unit id, the unit's expected primary response (K = rating / (droop ·
 *                         f0) MW/Hz, dead band); the following check removes its steady-state share
 *                         from the measured output and allows for its lag, so that a unit's
 *                         governor action is not taken for not following; a unit not listed gets none
 */
public record ControlCycleSettings(long cycleMs, List<AreaSetup> areas, PulseSettings pulses,
                                   InterlockSettings interlock, FollowingSettings following, long commandSettleMs,
                                   Map<String, GovernorResponse> governors) {
    public ControlCycleSettings {
        areas = List.copyOf(areas);
        governors = Map.copyOf(governors);
        if (cycleMs < 500 || cycleMs > 60_000) {
            throw new IllegalArgumentException("cycleMs must be in [500, 60000], was " + cycleMs);
        }
        if (areas.isEmpty()) {
            throw new IllegalArgumentException("at least one area is needed");
        }
        Set<String> ids = new HashSet<>();
        for (AreaSetup a : areas) {
            if (!ids.add(a.ace().areaId())) {
                throw new IllegalArgumentException("area " + a.ace().areaId() + " appears twice");
            }
            if (Math.abs(a.regulation().cycleS() * 1000 - cycleMs) > 1e-6) {
                throw new IllegalArgumentException("area " + a.ace().areaId() + ": regulation cycleS "
                        + a.regulation().cycleS() + " does not match cycleMs " + cycleMs);
            }
        }
        if (pulses == null || interlock == null || following == null) {
            throw new IllegalArgumentException("pulses, interlock and following settings are required");
        }
        if (commandSettleMs < 0) {
            throw new IllegalArgumentException("commandSettleMs must be >= 0, was " + commandSettleMs);
        }
    }

    /** Defaults for everything but the areas. */
    public static ControlCycleSettings of(long cycleMs, List<AreaSetup> areas) {
        return new ControlCycleSettings(cycleMs, areas, PulseSettings.DEFAULTS, InterlockSettings.DEFAULTS,
                FollowingSettings.DEFAULTS, 500, Map.of());
    }

    /** @return the cycle settings a site's areas, units and controller settings describe */
    public static ControlCycleSettings fromSite(ControllerSiteConfig site) {
        ControllerSettings s = site.settings();
        List<AreaSetup> setups = new ArrayList<>();
        Map<String, GovernorResponse> primary = new HashMap<>();
        for (SiteArea a : site.areas()) {
            AreaControlSettings.Builder b = AreaControlSettings.builder(a.id()).mode(s.aceMode())
                    .nominalFrequencyHz(a.nominalFrequencyHz());
            if (a.convention() == AceConvention.NORTH_AMERICAN) {
                b.northAmericanBias(a.bias());
            } else {
                b.europeanK(a.bias());
            }
            List<QuadraticCostUnit> costs = new ArrayList<>();
            for (SiteUnit u : site.units()) {
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
