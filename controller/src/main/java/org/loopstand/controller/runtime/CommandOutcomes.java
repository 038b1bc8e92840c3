package org.loopstand.controller.runtime;

import java.util.concurrent.ConcurrentLinkedQueue;
import org.loopstand.controller.cycle.ControlCycle;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;

/**
 * Feeds what became of each command back into the cycle: a refusal, a failed publish or an unsignable
 * command becomes {@link ControlCycle#commandNotExecuted}, an accepted ack
 * {@link ControlCycle#commandAccepted}. The commands awaiting their ack are kept once, in
 * {@link SentCommands}. Everything but {@link #publishFailed} runs on the agent thread.
 */
final class CommandOutcomes {
    private final ControlCycle cycle;
    private final SentCommands sent;
    /** seqs of commands whose publish failed (bus threads), handed to the cycle on the agent thread */
    private final ConcurrentLinkedQueue<Long> failedPublishes = new ConcurrentLinkedQueue<>();

    CommandOutcomes(ControlCycle cycle, SentCommands sent) {
        this.cycle = cycle;
        this.sent = sent;
    }

    /** No key was valid for the unit: the command was never sent. */
    void unsignable(PlannedCommand c) {
        cycle.commandNotExecuted(c.unitId(), c.deltaMw(), "unsignable");
    }

    /** From any thread: the bus reported the publish of command {@code seq} as failed. */
    void publishFailed(long seq) {
        failedPublishes.add(seq);
    }

    /** Hands failed publishes to the cycle (agent thread). */
    void drain() {
        Long seq;
        while ((seq = failedPublishes.poll()) != null) {
            PlannedCommand c = sent.forget(seq);
            if (c != null) {
                cycle.commandNotExecuted(c.unitId(), c.deltaMw(), "publishFailed");
            }
        }
    }

    /** The ack of command {@code c}, one of ours ({@link SentCommands#match}) (agent thread). */
    void onAck(PlannedCommand c, CommandAck ack) {
        if (ack.outcome() == AckOutcome.ACCEPTED) {
            cycle.commandAccepted(c.unitId());
        } else {
            cycle.commandNotExecuted(c.unitId(), c.deltaMw(), ack.reason() == null ? "refused" : ack.reason().wireName());
        }
    }
}
