package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * With {@code --clock bus} the controller's time stands still until the plant's clock runs; its
 * statuses must not (the units' watchdog counts from the go, and at rate 40 the next tick is 40 s of
 * scenario time away, more than the 30 s watchdog).
 */
class ControllerAgentClockHeldTest {
    private static final long WALL0 = 1_700_000_000_000L;
    private final MessageCodec codec = new MessageCodec();
    private final VirtualClock wall = new VirtualClock(WALL0);
    private final BusClock busClock = new BusClock(wall);
    private final InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
    private final TopicTree topics = TopicTree.forSite("two-area-textbook");
    private final List<ControllerStatus> statuses = new CopyOnWriteArrayList<>();

    @Test
    void shouldKeepSendingItsStatusInWallTimeWhileItsClockStandsStillAndStopOnceCyclesRun() {
        broker.connect("watch").subscribe(topics.controllerStatus("controller-1"), Qos.AT_LEAST_ONCE,
                m -> statuses.add(codec.decode(m.payload(), ControllerStatus.class).message().orElseThrow()));
        InMemoryBus plant = broker.connect("plant");
        ControllerAgent agent = new ControllerAgent(ClosedLoopStudyTest.twoAreaController("tieLineBias"),
                broker.connect("controller-1"), busClock, busClock, "controller-1", 1, null, null);
        agent.onStart();
        // the plant's clock, held at the scenario start until the controller is there
        plant.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(1, WALL0, 0, 40, false)),
                Qos.AT_MOST_ONCE, true, 0));
        for (int i = 0; i < 10; i++) { // one wall second, nothing but held ticks
            agent.doWork();
            wall.advanceMillis(100);
        }
        // "starting", at most the one cycle due at the held instant, then one status every 200 ms of wall
        // time: the units' watchdog stays fed
        assertThat(statuses.get(0).reasons()).containsExactly("starting");
        assertThat(statuses).filteredOn(s -> s.reasons().equals(List.of("waitingForClock"))).hasSizeGreaterThanOrEqualTo(4); // at 200, 400, 600, 800 ms
        long cyclesWhileHeld = agent.cyclesRun();
        assertThat(cyclesWhileHeld).isLessThanOrEqualTo(1);
        // the go: the clock runs at rate 40 (a tick every 100 ms of wall here, 4 s of scenario), cycles run and
        // take over the heartbeat
        for (int i = 0; i < 10; i++) {
            tick(plant, 2 + i, i * 4_000L);
            agent.doWork();
            wall.advanceMillis(100);
        }
        assertThat(agent.cyclesRun()).isGreaterThan(cyclesWhileHeld + 5); // 1 s of wall = 40 s of scenario = 10 cycles
        int atFirstCycle = statuses.size();
        for (int i = 0; i < 2; i++) { // 200 ms of wall = 8 s of scenario time at rate 40: two cycles
            tick(plant, 12 + i, (10 + i) * 4_000L);
            agent.doWork();
            wall.advanceMillis(100);
        }
        assertThat(statuses.subList(atFirstCycle, statuses.size())).noneMatch(s -> s.reasons().contains("waitingForClock"));
    }

    private void tick(InMemoryBus plant, long seq, long scenarioMs) {
        plant.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(seq, WALL0 + scenarioMs, scenarioMs, 40,
                true)), Qos.AT_MOST_ONCE, true, 0));
    }
}
