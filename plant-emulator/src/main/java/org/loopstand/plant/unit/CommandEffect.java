package org.loopstand.plant.unit;

import java.util.Locale;

import org.loopstand.plant.fault.PlantFaultFlags;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;

/**
 * What an accepted command did to the load reference: a pulse moves the target by the pulse rate times
 * its duration (up to the regulating limit; raise and lower swapped, or the pulse ignored, when a plant
 * fault says so), a setpoint moves it to the value held in the regulating range.
 *
 * @param sign   direction the target moved: +1, -1 or 0
 * @param detail {@code atLimit: …} when less was taken than asked, else null
 * @param acted  false when a plant fault made the unit ignore the pulse (acked as if taken)
 */
record CommandEffect(double sign, String detail, boolean acted) {

    /** Applies {@code c} to {@code motion}. */
    static CommandEffect apply(UnitCommand c, LoadReferenceMotion motion, UnitSettings settings, PlantFaultFlags faults) {
        if (c.kind() != CommandKind.PULSE) {
            double taken = motion.setpoint(c.setpointMw());
            return new CommandEffect(Math.signum(taken - motion.referenceMw()), taken != c.setpointMw()
                    ? String.format(Locale.ROOT, "atLimit: setpoint held at %.3f MW", taken) : null, true);
        }
        double askedMw = settings.pulseRateMwPerMin() * c.durationMs() / 60_000.0;
        PulseDirection wired = faults.swapRaiseLower()
                ? (c.direction() == PulseDirection.RAISE ? PulseDirection.LOWER : PulseDirection.RAISE) : c.direction();
        boolean acted = !faults.ignorePulses();
        // an ignored pulse is acked as if taken: the controller must find out from the output
        double takenMw = acted ? motion.pulse(wired, c.durationMs()) : (c.direction() == PulseDirection.RAISE ? askedMw : -askedMw);
        return new CommandEffect(Math.signum(takenMw), Math.abs(takenMw) < askedMw - 1e-9
                ? String.format(Locale.ROOT, "atLimit: moved %.3f MW of %.3f MW asked", Math.abs(takenMw), askedMw)
                : null, acted);
    }
}
