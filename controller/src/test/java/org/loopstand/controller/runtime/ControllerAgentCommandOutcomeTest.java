package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.topic.TopicTree;

/** Acks fed back from the bus into the cycle, on the agent level. */
class ControllerAgentCommandOutcomeTest {
    private final MessageCodec codec = new MessageCodec();
    private final StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
            ClosedLoopStudyTest.twoAreaController("tieLineBias"));

    private ControllerStatus lastStatus() {
        List<InboundMessage> s = loop.published.stream().filter(m -> m.topic().contains("/controller/")).toList();
        return codec.decode(s.get(s.size() - 1).payload(), ControllerStatus.class).message().orElseThrow();
    }

    @Test
    void shouldSuspendWithStaleEpochWhenAUnitRefusesACommandAsFromASupersededEpoch() {
        loop.runTo(40);
        loop.sim.stepLoadMw("area1", 100);
        loop.runTo(60);
        List<UnitCommand> sent = loop.commands();
        assertThat(sent).isNotEmpty();
        UnitCommand last = sent.get(sent.size() - 1);
        // the unit's answer as it would come once another controller instance has taken over
        CommandAck refusal = new CommandAck(1_000_000, loop.clock.epochMillis(), last.unit(), last.seq(),
                last.controllerId(), AckOutcome.REJECTED, RefusalReason.WRONG_EPOCH, "superseded");
        loop.broker.connect("unit-stand-in").publish(OutboundMessage.of(
                TopicTree.forSite(loop.sim.grid().siteId()).unitAck(last.unit()), codec.encode(refusal),
                Qos.AT_LEAST_ONCE));
        loop.runTo(64);
        int commandsAtSuspension = loop.commands().size();
        loop.runTo(120);
        ControllerStatus s = lastStatus();
        assertThat(s.state()).isEqualTo(ControllerState.SUSPENDED);
        assertThat(s.reasons()).containsExactly("staleEpoch:" + last.unit());
        assertThat(loop.commands()).hasSize(commandsAtSuspension);
    }
}
