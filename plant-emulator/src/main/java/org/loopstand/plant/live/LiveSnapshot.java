package org.loopstand.plant.live;

import java.util.List;

/**
 * What the live view shows at one moment, taken on the plant thread and read by the HTTP threads
 * (immutable). Quantities carry their units in their names; {@code NaN}/null = not known yet.
 *
 * @param seq         increasing number of this snapshot, from 1
 * @param timeS       scenario time, s
 * @param rate        scenario seconds per wall second
 * @param state       {@code waiting} (held before go), {@code running} or {@code finished}
 * @param areas       each area: frequency truth and metered, plant-side ACE, interchange
 * @param ties        each tie's flow
 * @param units       each unit with an interface in this process
 * @param controller  the controller's last status as the plant heard it, null before the first
 * @param faults      active faults
 * @param checks      scenario checks: their names before the end, their decided lines after
 * @param lateness    step lateness so far
 */
public record LiveSnapshot(long seq, double timeS, double rate, String state, List<AreaView> areas, List<TieView> ties,
                           List<UnitView> units, ControllerView controller, List<FaultView> faults, List<String> checks,
                           LatenessView lateness) {
    /**
     * @param aceMw                plant-side ACE from truth against the site's schedule, MW
     * @param meteredFrequencyHz   last frequency published by the area's meter (after faults), Hz
     * @param controllerAceMw      the controller's ACE from its status, MW (NaN when not published)
     */
    public record AreaView(String id, double frequencyHz, double meteredFrequencyHz, double aceMw, double controllerAceMw,
                           double netInterchangeMw, double scheduledNetInterchangeMw) {
    }

    public record TieView(String id, String fromArea, String toArea, double flowMw) {
    }

    /**
     * @param targetMw     the load reference target the interface drives to, MW
     * @param lastCommand  last command and its fate, for people ("" before the first)
     * @param refusals     commands refused so far
     */
    public record UnitView(String id, String area, double outputMw, double loadReferenceMw, double targetMw,
                           double regulatingMinMw, double regulatingMaxMw, String mode, boolean online, String lastCommand,
                           long accepted, long refusals) {
    }

    /**
     * @param heldAreas     areas the controller holds while it regulates the others, each "area (reasons)"
     * @param excludedUnits units it leaves out of the allocation, each "unit (reason)"
     * @param ageS          how long ago the status arrived, s of the plant's clock
     */
    public record ControllerView(String id, String state, List<String> reasons, long cycle, List<String> heldAreas,
                                 List<String> excludedUnits, double ageS) {
        /** The view of a status as the plant heard it {@code ageS} seconds ago. */
        public static ControllerView of(org.loopstand.protocol.message.ControllerStatus st, double ageS) {
            List<String> held = st.suspendedAreas() == null ? List.of() : st.suspendedAreas().stream()
                    .map(a -> a.area() + " (" + String.join(", ", a.reasons()) + ")").toList();
            List<String> excluded = st.excludedUnits() == null ? List.of() : st.excludedUnits().stream()
                    .map(u -> u.unit() + " (" + u.reason() + ")").toList();
            return new ControllerView(st.controllerId(), st.state().wireName(), st.reasons(), st.cycle(), held, excluded, ageS);
        }
    }

    public record FaultView(String id, String type, List<String> targets, String source, double activeForS) {
    }

    public record LatenessView(long p99Us, long maxUs, long steps) {
    }
}
