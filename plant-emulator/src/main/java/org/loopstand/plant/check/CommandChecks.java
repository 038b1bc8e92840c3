package org.loopstand.plant.check;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.stream.Collectors;

import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.unit.CommandGate;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.RefusalReason;

/** Checks on the commands the plant side received and what the units did with them. */
final class CommandChecks {
    private CommandChecks() {
    }

    /**
     * No pulse or setpoint issued to a unit of the area while its meter data was stale, lost or wrong
     * (a stale, loss, value or plant-connection fault acting on it: a frozen or falsified value is as
     * unusable as a missing one), after a detection allowance of detectS. Setpoints count as well: a
     * controller that prefers setpoints moves units just as blindly with them.
     */
    static CheckOutcome noPulseWhileStale(CheckSpec spec, RunRecord run, Grid grid) {
        String area = spec.text("area");
        double detectS = spec.number("detectS");
        List<double[]> windows = new ArrayList<>();
        for (RunRecord.FaultWindow w : run.faults()) {
            boolean meterFault = (w.category().equals("STALE") || w.category().equals("LOSS")
                    || w.category().equals("VALUE")) && w.targets().contains(area);
            boolean linkFault = w.category().equals("CONNECTION") && w.targets().contains("plant");
            if (meterFault || linkFault) {
                windows.add(new double[] {w.startS() + detectS, Math.min(w.endS(), run.endS())});
            }
        }
        if (windows.isEmpty()) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "commands", 0,
                    "no stale, loss or value fault acted on the meters of " + area + " during the run: nothing to judge",
                    false);
        }
        Set<String> units = grid.units().stream().filter(u -> u.area().equals(area)).map(GeneratingUnit::id)
                .collect(Collectors.toSet());
        long start = run.runStartEpochMs();
        long bad = 0;
        int considered = 0;
        for (RunRecord.CommandRecord c : run.commands()) {
            if (!units.contains(c.command().unit()) || c.fate().equals("dropped")) {
                continue;
            }
            considered++;
            double issuedS = (c.command().issuedAt() - start) / 1000.0;
            if (windows.stream().anyMatch(w -> issuedS >= w[0] && issuedS < w[1])) {
                bad++;
            }
        }
        String when = windows.stream().map(w -> "[" + CheckOutcome.format(w[0]) + ", " + CheckOutcome.format(w[1]) + ") s")
                .collect(Collectors.joining(", "));
        return new CheckOutcome(spec.name(), bad == 0, bad, "commands", 0, bad + " of " + considered
                + " commands (pulses and setpoints) to units of " + area + " were issued while its meter data was stale or faulty ("
                + when + ", after "
                + CheckOutcome.format(detectS) + " s to notice)", false);
    }

    /**
     * Every command that reached the unit after its validUntil was refused and not acted on: as expired, or
     * by a rule the unit applies before the expiry ({@link CommandGate#DECIDED_BEFORE_EXPIRY}, counted in the
     * detail; a delayed command overtaken by a newer one is refused as out of order, for instance).
     */
    static CheckOutcome expiredCommandsRefused(CheckSpec spec, RunRecord run, Grid grid) {
        String unit = spec.text("unit");
        long start = run.runStartEpochMs();
        int expired = 0;
        int wrong = 0;
        java.util.Map<RefusalReason, Integer> earlier = new java.util.EnumMap<>(RefusalReason.class);
        for (RunRecord.CommandRecord c : run.commands()) {
            if (!c.command().unit().equals(unit) || c.outcome() == null) {
                continue;
            }
            long receivedMs = start + Math.round(c.receivedS() * 1000);
            if (receivedMs > c.command().validUntil()) {
                expired++;
                boolean refused = !c.acted() && c.outcome() != AckOutcome.ACCEPTED;
                if (refused && CommandGate.DECIDED_BEFORE_EXPIRY.contains(c.reason())) {
                    earlier.merge(c.reason(), 1, Integer::sum);
                } else if (!refused || c.reason() != RefusalReason.EXPIRED) {
                    wrong++;
                }
            }
        }
        String earlierText = earlier.isEmpty() ? "" : "; refused by a rule the unit applies before the expiry: "
                + earlier.entrySet().stream().map(e -> e.getValue() + " " + e.getKey().wireName()).collect(Collectors.joining(", "));
        double minExpired = spec.number("minExpired");
        if (expired < minExpired) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "commands", 0, "only " + expired
                    + " expired commands reached " + unit + "; the check needs at least " + CheckOutcome.format(minExpired), false);
        }
        return new CheckOutcome(spec.name(), wrong == 0, wrong, "commands", 0, wrong + " of " + expired
                + " expired commands to " + unit + " were accepted, acted on or refused for another reason" + earlierText, false);
    }
}
