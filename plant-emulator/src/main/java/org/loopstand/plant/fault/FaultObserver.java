package org.loopstand.plant.fault;

import java.util.List;

import org.loopstand.protocol.message.UnitCommand;

/**
 * Told about every fault start/stop/refusal and every publication or command a fault touched. The
 * journal ({@link FaultJournal}) and the run record of the checks both listen. Called on the agent
 * thread; times are scenario epoch ms.
 */
public interface FaultObserver {
    FaultObserver NONE = new FaultObserver() {
    };

    /** @param source {@code scenario} or {@code order} */
    default void faultStarted(long tMs, FaultSpec spec, String source) {
    }

    default void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
    }

    /** A fault order or scenario fault that was not applied, with why. */
    default void faultRefused(long tMs, String orderId, String reason) {
    }

    /** One publication that went through the fault stage (affected or not). */
    default void published(long tMs, Publication publication) {
    }

    /** A command the command-path stage touched (dropped, delayed, duplicated) or passed. */
    default void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
    }

    /**
     * A network fault acted on the links between hosts, or could not.
     *
     * @param action what was done: {@code partition}, {@code delayLoss}, {@code partitionLifted},
     *               {@code delayLossLifted}, or {@code notApplied} / {@code notLifted} (see detail)
     * @param links  the links changed, as the host links name them
     * @param detail why it could not be done; empty when it was
     */
    default void networkFault(long tMs, FaultSpec spec, String action, List<String> links, String detail) {
    }

    /** @return an observer telling each of {@code observers} in order */
    static FaultObserver all(List<FaultObserver> observers) {
        List<FaultObserver> list = List.copyOf(observers);
        return new FaultObserver() {
            @Override
            public void faultStarted(long tMs, FaultSpec spec, String source) {
                list.forEach(o -> o.faultStarted(tMs, spec, source));
            }

            @Override
            public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
                list.forEach(o -> o.faultStopped(tMs, spec, source, reason));
            }

            @Override
            public void faultRefused(long tMs, String orderId, String reason) {
                list.forEach(o -> o.faultRefused(tMs, orderId, reason));
            }

            @Override
            public void published(long tMs, Publication publication) {
                list.forEach(o -> o.published(tMs, publication));
            }

            @Override
            public void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
                list.forEach(o -> o.commandPassed(tMs, command, fate, faultIds));
            }

            @Override
            public void networkFault(long tMs, FaultSpec spec, String action, List<String> links, String detail) {
                list.forEach(o -> o.networkFault(tMs, spec, action, links, detail));
            }
        };
    }
}
