package org.loopstand.plant.check;

import static org.loopstand.plant.fault.ParameterSpec.choice;
import static org.loopstand.plant.fault.ParameterSpec.number;

import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

import org.loopstand.plant.fault.ParameterSpec;

/** Every check type with its parameters: one list for the scenario loader, the report and docs/faults.md. */
public final class CheckLibrary {
    private static final ParameterSpec AFTER_S = number("afterS", "s", 0, 31_536_000, Double.NaN,
            "moment to measure from, scenario s (or give after)");
    private static final ParameterSpec AFTER = choice("after", "", List.of(),
            "event type (its first occurrence) or fault id (its start) to measure from, instead of afterS");
    private static final ParameterSpec HOLD_S = number("holdS", "s", 0, 31_536_000, Double.NaN,
            "how long it must stay in band once back, s (not set: to the end of the run)");
    private static final ParameterSpec WITHIN_900 = number("withinS", "s", 0, 31_536_000, 900.0, "limit, s");
    private static final CheckLibrary STANDARD = build();

    private final Map<String, CheckType> types = new LinkedHashMap<>();

    private CheckLibrary(List<CheckType> list) {
        list.forEach(t -> types.put(t.name(), t));
    }

    public static CheckLibrary standard() {
        return STANDARD;
    }

    public Optional<CheckType> type(String name) {
        return Optional.ofNullable(types.get(name));
    }

    public Collection<CheckType> types() {
        return types.values();
    }

    public Set<String> names() {
        return types.keySet();
    }

    private static CheckLibrary build() {
        List<CheckType> t = new ArrayList<>();
        t.add(new CheckType("frequencyRestored", List.of(choice("area", null, List.of(), "area id"), AFTER_S, AFTER, WITHIN_900,
                number("bandMhz", "mHz", 0, 5000, 20.0, "band around scheduled frequency"), HOLD_S), false, true,
                "truth frequency back within ±bandMhz of schedule, and staying there (holdS, or to the end), within withinS",
                RestorationChecks::frequencyRestored));
        t.add(new CheckType("tieFlowRestored", List.of(choice("tie", null, List.of(), "tie id"), AFTER_S, AFTER, WITHIN_900,
                number("bandMw", "MW", 0, 100_000, 10.0, "band around the scheduled flow"), HOLD_S), false, true,
                "truth tie flow back within ±bandMw of its schedule, and staying there (holdS, or to the end), within withinS",
                RestorationChecks::tieFlowRestored));
        t.add(new CheckType("aceRecovered", List.of(choice("area", null, List.of(), "area id"), AFTER_S, AFTER, WITHIN_900,
                number("toleranceMw", "MW", 0, 100_000, 5.0, "how close to the recovery target counts as back")), false, true,
                "truth ACE back to zero (or its pre-disturbance value if that was negative) within withinS (BAL-002 style)",
                RestorationChecks::aceRecovered));
        t.add(new CheckType("noPulseWhileStale", List.of(choice("area", null, List.of(), "area whose meter was stale"),
                number("detectS", "s", 0, 3600, 12.0, "allowance to notice stale data (three 4 s cycles)")), false, false,
                "no pulse or setpoint issued to the area's units while its meter data was stale, lost or faulty (value "
                        + "faults such as holdLast, stuckAt, bias), after detectS",
                CommandChecks::noPulseWhileStale));
        t.add(new CheckType("expiredCommandsRefused", List.of(choice("unit", null, List.of(), "unit id"),
                number("minExpired", "commands", 0, 1_000_000, 1.0, "fewest expired commands that must arrive for a verdict")),
                false, false, "every command reaching the unit after validUntil was refused: as expired, or by a rule the"
                        + " unit applies first (seq, epoch, signature)",
                CommandChecks::expiredCommandsRefused));
        t.add(new CheckType("suspendedWithin", List.of(choice("controller", "*", List.of(), "controller id (* = any)"),
                choice("area", "*", List.of(), "area whose suspension counts (* = any)"), AFTER_S,
                AFTER, number("withinS", "s", 0, 3600, 8.0, "limit (two 4 s cycles)")), true, true,
                "controller side: the controller published state suspended, or the area among its suspendedAreas, within withinS",
                ControllerChecks::suspendedWithin));
        t.add(new CheckType("noBumpAfterResume", List.of(choice("area", "*", List.of(), "area (* = every area)"),
                number("windowS", "s", 1, 600, 8.0, "the first commands: issued within this long of the resume (two 4 s cycles)"),
                number("gapS", "s", 1, 3600, 12.0, "a silence of the status this long, then regulating, is a resume too"),
                number("toleranceMw", "MW", 0, 100_000, 10.0, "allowance beyond what the ACE calls for")), true, false,
                "controller side: after it regulates an area again (suspension or silence), the change its commands ask of the "
                        + "area's units in the first windowS lies between 0 and what the truth ACE at that moment calls for",
                ResumeChecks::noBumpAfterResume));
        return new CheckLibrary(t);
    }
}
