package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.CompletableFuture;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.time.VirtualClock;

/** How the controller stops or goes on when a part of it fails. */
class ControllerAgentFailureTest {
    private final MessageCodec codec = new MessageCodec();

    private ControllerStatus lastStatus(StudyLoop loop) {
        List<InboundMessage> s = loop.published.stream().filter(m -> m.topic().contains("/controller/")).toList();
        return codec.decode(s.get(s.size() - 1).payload(), ControllerStatus.class).message().orElseThrow();
    }

    @Test
    void shouldPublishOffBeforeStoppingWhenTheJournalFails(@TempDir Path dir) {
        JournalWriter journal = JournalWriter.create(dir.resolve("controller.jsonl"), "controller", StudyLoop.START_MS,
                new VirtualClock(0));
        StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(), journal);
        loop.runTo(40);
        assertThat(lastStatus(loop).state()).isEqualTo(ControllerState.REGULATING);
        journal.close(loop.clock.epochMillis(), EndReason.STOPPED); // the journal can no longer be written
        assertThatThrownBy(() -> loop.runTo(50)).isInstanceOf(IllegalStateException.class);
        loop.agent.onClose(); // what the runner does after doWork threw
        assertThat(lastStatus(loop).state()).isEqualTo(ControllerState.OFF);
    }

    @Test
    void shouldSendTheRestOfTheCyclesCommandsWhenOneCannotBeSent() {
        String failing = "/unit/" + firstUnitOf("area1") + "/command";
        StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(), null,
                bus -> new ForwardingBus(bus) {
                    @Override
                    public CompletableFuture<Void> publish(OutboundMessage m) {
                        if (m.topic().endsWith(failing)) {
                            throw new IllegalStateException("publish refused for the test");
                        }
                        return super.publish(m);
                    }
                });
        loop.runTo(40);
        loop.sim.stepLoadMw("area1", 100);
        loop.sim.stepLoadMw("area2", 100);
        loop.runTo(90);
        assertThat(loop.commands()).isNotEmpty();
        assertThat(loop.commands()).allSatisfy(c -> assertThat(c.unit()).isNotEqualTo(firstUnitOf("area1")));
        assertThat(loop.agent.cyclesRun()).isGreaterThanOrEqualTo(20);
    }

    private static String firstUnitOf(String area) {
        return ClosedLoopStudyTest.twoAreaGrid().units().stream().filter(u -> u.area().equals(area)).findFirst()
                .orElseThrow().id();
    }
}
