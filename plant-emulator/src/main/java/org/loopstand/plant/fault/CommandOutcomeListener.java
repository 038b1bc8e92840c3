package org.loopstand.plant.fault;

import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

/** Told by a unit plant interface what became of each command it handled (the checks' run record listens). */
@FunctionalInterface
public interface CommandOutcomeListener {
    CommandOutcomeListener NONE = (nowMs, c, o, r, acted) -> {
    };

    /**
     * @param nowMs   when the unit handled it, scenario epoch ms
     * @param outcome the ack's outcome
     * @param reason  refusal reason, null when accepted
     * @param acted   whether the load reference was moved for it (false for an ignored pulse)
     */
    void handled(long nowMs, UnitCommand command, AckOutcome outcome, RefusalReason reason, boolean acted);
}
