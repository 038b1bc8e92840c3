package org.loopstand.app.lockstep;

import java.util.List;

import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.Publication;
import org.loopstand.protocol.message.UnitCommand;

/**
 * The study's fault engine is built before its participants, the plant journal with them (it needs the
 * study's virtual clock): this observer is handed to the engine first and forwards to the journal
 * once it exists. Nothing is told before then, as no fault starts before the first step.
 */
final class JournalForwarder implements FaultObserver {
    private FaultObserver target = FaultObserver.NONE;

    void to(FaultObserver journal) {
        this.target = journal;
    }

    @Override
    public void faultStarted(long tMs, FaultSpec spec, String source) {
        target.faultStarted(tMs, spec, source);
    }

    @Override
    public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
        target.faultStopped(tMs, spec, source, reason);
    }

    @Override
    public void faultRefused(long tMs, String orderId, String reason) {
        target.faultRefused(tMs, orderId, reason);
    }

    @Override
    public void published(long tMs, Publication publication) {
        target.published(tMs, publication);
    }

    @Override
    public void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
        target.commandPassed(tMs, command, fate, faultIds);
    }
}
