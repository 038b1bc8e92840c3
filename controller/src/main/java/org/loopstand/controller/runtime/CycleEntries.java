package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.loopstand.controller.cycle.CycleOutcome;
import org.loopstand.controller.cycle.CycleScheduler;
import org.loopstand.controller.cycle.CycleTick;
import org.loopstand.protocol.message.AreaAce;

/**
 * The fields of the controller journal's cycle entries, in a fixed order: {@code decided}, one per cycle,
 * and {@code cycleClock}, once when the schedule starts.
 */
final class CycleEntries {
    private CycleEntries() {
    }

    /** @return where cycle n starts on the monotonic time base: what a replay needs to number its cycles alike */
    static Map<String, Object> cycleClock(CycleScheduler scheduler) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("t0Ns", scheduler.t0Nanos());
        f.put("periodNs", scheduler.periodNanos());
        return f;
    }

    /**
     * @param tick   the cycle's tick (number, jitter, cycles missed, monotonic start)
     * @param o      what the cycle decided
     * @param aces   each area's ACE as the status shows it
     * @param linkUp whether the bus link was up for this cycle
     * @param used   ages of what the cycle used ({@link InputUseJournal#used})
     * @param intake the intake's running counters ({@link InputUseJournal#counters})
     */
    static Map<String, Object> decided(CycleTick tick, CycleOutcome o, List<AreaAce> aces, boolean linkUp,
                                      Map<String, Object> used, Map<String, Object> intake) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("cycle", tick.cycleNumber());
        f.put("state", o.state().name().toLowerCase(Locale.ROOT));
        f.put("reasons", o.reasons());
        f.put("areas", aces);
        f.put("commands", o.commands().size());
        f.put("notes", o.notes());
        f.put("excludedUnits", List.copyOf(o.excludedUnits()));
        f.put("suspendedAreas", o.suspendedAreas().stream()
                .map(a -> Map.of("area", a.areaId(), "reasons", a.reasons())).toList());
        f.put("jitterUs", tick.jitterNanos() / 1000);
        f.put("missedBefore", tick.missedBefore());
        f.put("pollNs", tick.actualStartNanos()); // the monotonic reading that started this cycle: replay sets it back
        f.put("linkUp", linkUp);
        f.put("used", used);
        f.put("intake", intake);
        return f;
    }
}
