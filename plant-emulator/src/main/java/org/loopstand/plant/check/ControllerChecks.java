package org.loopstand.plant.check;

import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.message.ControllerState;

/** Checks on the controller's own decisions, read from the status it published (controller side). */
final class ControllerChecks {
    private ControllerChecks() {
    }

    /** The controller reported itself suspended within withinS of afterS. */
    static CheckOutcome suspendedWithin(CheckSpec spec, RunRecord run, Grid grid) {
        String controller = spec.text("controller");
        double after = spec.number("afterS");
        double within = spec.number("withinS");
        for (RunRecord.StatusRecord s : run.statuses()) {
            boolean ours = controller.equals("*") || controller.equals(s.status().controllerId());
            if (ours && s.receivedS() >= after && s.status().state() == ControllerState.SUSPENDED) {
                double delay = s.receivedS() - after;
                return new CheckOutcome(spec.name(), delay <= within, delay, "s", within, s.status().controllerId()
                        + " reported suspended at " + CheckOutcome.format(s.receivedS()) + " s, reasons " + s.status().reasons(), true);
            }
        }
        return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, "no suspended status from "
                + (controller.equals("*") ? "any controller" : controller) + " after " + CheckOutcome.format(after) + " s ("
                + run.statuses().size() + " statuses received)", true);
    }
}
