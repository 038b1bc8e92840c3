package org.loopstand.plant.check;

import java.util.List;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.SuspendedArea;

/** Checks on the controller's own decisions, read from the status it published (controller side). */
final class ControllerChecks {
    private ControllerChecks() {
    }

    /**
     * The controller reported itself suspended, or the area ({@code *} = any) among its suspended
     * areas while it regulated others, within withinS of afterS.
     */
    static CheckOutcome suspendedWithin(CheckSpec spec, RunRecord run, Grid grid) {
        String controller = spec.text("controller");
        String area = spec.text("area");
        double after = spec.number("afterS");
        double within = spec.number("withinS");
        for (RunRecord.StatusRecord s : run.statuses()) {
            boolean ours = controller.equals("*") || controller.equals(s.status().controllerId());
            if (ours && s.receivedS() >= after && suspended(s.status(), area)) {
                double delay = s.receivedS() - after;
                String what = s.status().state() == ControllerState.SUSPENDED ? " reported suspended at "
                        : " reported area " + areasOf(s.status()) + " suspended at ";
                List<String> reasons = s.status().state() == ControllerState.SUSPENDED || s.status().suspendedAreas() == null
                        ? s.status().reasons()
                        : s.status().suspendedAreas().stream().flatMap(a -> a.reasons().stream()).toList();
                return new CheckOutcome(spec.name(), delay <= within, delay, "s", within, s.status().controllerId()
                        + what + CheckOutcome.format(s.receivedS()) + " s, reasons " + reasons, true);
            }
        }
        return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, "no suspended status from "
                + (controller.equals("*") ? "any controller" : controller) + " after " + CheckOutcome.format(after) + " s ("
                + run.statuses().size() + " statuses received)", true);
    }

    private static boolean suspended(ControllerStatus s, String area) {
        if (s.state() == ControllerState.SUSPENDED) {
            return true;
        }
        return s.suspendedAreas() != null
                && s.suspendedAreas().stream().anyMatch(a -> "*".equals(area) || a.area().equals(area));
    }

    private static List<String> areasOf(ControllerStatus s) {
        return s.suspendedAreas().stream().map(SuspendedArea::area).toList();
    }
}
