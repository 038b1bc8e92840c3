package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.safety.InterlockState;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;

/** Every safety interlock of the controller process, on the agent level over the bus. */
class ControllerAgentInterlockTest {
    private final MessageCodec codec = new MessageCodec();
    private final StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
            ClosedLoopStudyTest.twoAreaController("tieLineBias"));

    private List<InboundMessage> commandsOnBus() {
        return loop.published.stream().filter(m -> m.topic().endsWith("/command")).toList();
    }

    private List<InboundMessage> fromController() {
        return loop.published.stream()
                .filter(m -> m.topic().endsWith("/command") || m.topic().contains("/controller/")).toList();
    }

    private ControllerStatus lastStatus() {
        List<InboundMessage> s = loop.published.stream().filter(m -> m.topic().contains("/controller/")).toList();
        return codec.decode(s.get(s.size() - 1).payload(), ControllerStatus.class).message().orElseThrow();
    }

    /** Regulating with work to do: a 100 MW step in area 1 twenty seconds ago. */
    private void regulateAfterAStep() {
        loop.runTo(40);
        assertThat(lastStatus().state()).isEqualTo(ControllerState.REGULATING);
        loop.sim.stepLoadMw("area1", 100);
        loop.runTo(60);
        assertThat(commandsOnBus()).isNotEmpty();
    }

    @Test
    void shouldSuspendAndSendNothingWhenAFrequencyMeterGoesStalePastItsHoldTime() {
        regulateAfterAStep();
        loop.tap.silentAreas.add("area1");
        // max age 10 s + hold 8 s (defaults): still regulating on the held value at 15 s
        loop.runTo(75);
        assertThat(loop.agent.lastOutcome().state()).isEqualTo(InterlockState.REGULATING);
        loop.runTo(82);
        int commandsAtSuspension = commandsOnBus().size();
        loop.runTo(140);
        ControllerStatus s = lastStatus();
        assertThat(s.state()).isEqualTo(ControllerState.SUSPENDED);
        assertThat(s.reasons()).contains("frequencyUnusable:area1");
        assertThat(commandsOnBus()).hasSize(commandsAtSuspension);
        // area 2's ACE is still computed and reported while suspended
        assertThat(s.areas()).extracting(a -> a.area()).containsExactly("area2");
    }

    @Test
    void shouldPublishNothingOnceTheBusLinkIsDownAndLeaveTheOfflineLastWill() {
        regulateAfterAStep();
        int before = fromController().size();
        StudyLoop.controllerConnection(loop).kill(); // its connection listener is told
        loop.runTo(100);
        // the only thing after the loss is the broker's last will: the retained offline status
        assertThat(fromController()).hasSize(before + 1);
        assertThat(lastStatus().state()).isEqualTo(ControllerState.OFFLINE);
        // with the link down the meters stop arriving too; the link reason comes first
        assertThat(loop.agent.lastOutcome().reasons()).startsWith("busLinkDown");
        assertThat(loop.agent.lastOutcome().commands()).isEmpty();
        assertThat(StudyLoop.controllerConnection(loop).counters().sendFailed()).isZero();
    }

    @Test
    void shouldSuspendWhenAceExceedsTheSanityLimitBecauseOfATieFlowDataError() {
        regulateAfterAStep();
        int before = commandsTo("gen1");
        loop.tap.tieErrorMwByArea.put("area1", 5000.0); // |ACE| ≈ 5000 MW > 2000 MW limit
        loop.runTo(66);
        int atSuspension = commandsTo("gen1");
        // area 1 alone is left out first: its ACE is beyond the limit, area 2's is its own and sane
        ControllerStatus first = lastStatus();
        assertThat(first.state()).isEqualTo(ControllerState.REGULATING);
        assertThat(first.suspendedAreas()).singleElement().satisfies(a -> {
            assertThat(a.area()).isEqualTo("area1");
            assertThat(a.reasons()).containsExactly("aceBeyondSanityLimit:area1");
            assertThat(a.detail()).startsWith("ace:area1 aceMw=").endsWith("limitMw=2000");
        });
        loop.runTo(120);
        ControllerStatus s = lastStatus();
        assertThat(s.state()).isEqualTo(ControllerState.SUSPENDED);
        // three cycles later the tie ends cross check names the tie itself: area 1's end disagrees with
        // area 2's, and a tie unusable at either end suspends both areas
        assertThat(s.reasons()).contains("tieFlowUnusable:area1:tie12");
        assertThat(s.suspendedAreas()).extracting(a -> a.area()).containsExactly("area1", "area2");
        assertThat(atSuspension - before).isLessThanOrEqualTo(2); // at most the cycles before the first bad scan
        assertThat(commandsTo("gen1")).isEqualTo(atSuspension);
        int all = commandsOnBus().size();
        loop.runTo(160);
        assertThat(commandsOnBus()).hasSize(all);
    }

    @Test
    void shouldSuspendOnlyTheAreaWhoseFrequencyIsStuckAndResumeItWhenTheMeterIsLiveAgain() {
        regulateAfterAStep();
        loop.tap.stuckFrequencyHzByArea.put("area1", 59.98);
        loop.runTo(100); // 12 identical readings make it frozen
        ControllerStatus s = lastStatus();
        assertThat(s.state()).isEqualTo(ControllerState.REGULATING);
        assertThat(s.suspendedAreas()).singleElement().satisfies(a -> {
            assertThat(a.area()).isEqualTo("area1");
            assertThat(a.reasons()).containsExactly("frequencyUnusable:area1");
            assertThat(a.detail()).startsWith("frequency:area1 frozen");
        });
        int gen1 = commandsTo("gen1");
        int gen2 = commandsTo("gen2");
        assertThat(gen2).isZero(); // tie-line bias: area 2 had nothing to do for area 1's step
        // area 2's own step while area 1 is out: area 2 regulates on and its unit takes it
        loop.sim.stepLoadMw("area2", 80);
        loop.runTo(160);
        assertThat(commandsTo("gen1")).isEqualTo(gen1);
        assertThat(commandsTo("gen2")).isGreaterThan(5);
        assertThat(lastStatus().suspendedAreas()).extracting(a -> a.area()).containsExactly("area1");
        loop.tap.stuckFrequencyHzByArea.clear();
        loop.runTo(200);
        assertThat(lastStatus().suspendedAreas()).isNull();
        assertThat(commandsTo("gen1")).isGreaterThan(gen1);
    }

    private int commandsTo(String unit) {
        return (int) commandsOnBus().stream().filter(m -> m.topic().contains("/unit/" + unit + "/")).count();
    }

    @Test
    void shouldResumeWithoutABumpAfterTheUnitWasMovedWhileSuspended() {
        loop.runTo(60);
        loop.tap.silentAreas.add("area1");
        loop.runTo(100);
        assertThat(lastStatus().state()).isEqualTo(ControllerState.SUSPENDED);
        // while suspended another desk moves the unit by 30 MW, outside the controller's knowledge
        double refBefore = loop.sim.loadReferenceMw("gen1");
        loop.operatorPulse("gen1", PulseDirection.RAISE, 3_000); // 600 MW/min × 3 s = 30 MW
        loop.runTo(110);
        assertThat(loop.sim.loadReferenceMw("gen1") - refBefore).isCloseTo(30, within(1e-6));
        loop.runTo(140);
        int before = commandsOnBus().size();
        loop.tap.silentAreas.clear();
        loop.runTo(200);
        assertThat(lastStatus().state()).isEqualTo(ControllerState.REGULATING);
        List<InboundMessage> after = commandsOnBus().subList(before, commandsOnBus().size());
        assertThat(after).isNotEmpty();
        UnitCommand first = codec.decode(after.get(0).payload(), UnitCommand.class).message().orElseThrow();
        // the old integrator would pull gen1 straight back by 30 MW; tracking starts from where it is:
        // a pulse of 600 MW/min × duration must stay well below that
        double firstMoveMw = first.durationMs() * 600.0 / 60000.0;
        assertThat(firstMoveMw).isLessThan(15.0);
    }
}
