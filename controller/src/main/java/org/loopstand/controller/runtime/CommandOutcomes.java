package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import org.loopstand.controller.cycle.ControlCycle;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;

/**
 * Feeds what became of each command back into the cycle: the commands sent are kept by seq until
 * their ack; a refusal, a failed publish or an unsignable command becomes
 * {@link ControlCycle#commandNotExecuted}, an accepted ack {@link ControlCycle#commandAccepted}.
 * Bounded: the oldest unanswered commands are forgotten past 4096. Everything but
 * {@link #publishFailed} runs on the agent thread.
 */
final class CommandOutcomes {
    private static final int MAX_UNANSWERED = 4096;
    private final ControlCycle cycle;
    private final String controllerId;
    private final Map<Long, PlannedCommand> unanswered = new LinkedHashMap<>(16, 0.75f, false) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<Long, PlannedCommand> eldest) {
            return size() > MAX_UNANSWERED;
        }
    };
    /** seqs of commands whose publish failed (bus threads), handed to the cycle on the agent thread */
    private final ConcurrentLinkedQueue<Long> failedPublishes = new ConcurrentLinkedQueue<>();

    CommandOutcomes(ControlCycle cycle, String controllerId) {
        this.cycle = cycle;
        this.controllerId = controllerId;
    }

    void sent(long seq, PlannedCommand c) {
        unanswered.put(seq, c);
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
            PlannedCommand c = unanswered.remove(seq);
            if (c != null) {
                cycle.commandNotExecuted(c.unitId(), c.deltaMw(), "publishFailed");
            }
        }
    }

    /** A unit's ack (agent thread); acks to other controllers' commands are ignored. */
    void onAck(CommandAck ack) {
        if (!controllerId.equals(ack.controllerId())) {
            return;
        }
        PlannedCommand c = unanswered.get(ack.commandSeq());
        if (c == null || !c.unitId().equals(ack.unit())) {
            return; // not an answer to a command of ours we still know
        }
        unanswered.remove(ack.commandSeq());
        if (ack.outcome() == AckOutcome.ACCEPTED) {
            cycle.commandAccepted(c.unitId());
        } else {
            cycle.commandNotExecuted(c.unitId(), c.deltaMw(), ack.reason() == null ? "refused" : ack.reason().wireName());
        }
    }
}
