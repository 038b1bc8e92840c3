package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.PlantClockFollower;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * A unit interface in a process of its own ({@code unit --clock bus}) keeps to the plant's scenario time
 * after the first tick: while the plant's pace keeper holds its clock or runs it slower, the unit judges
 * a command's validUntil on the plant's time, not on the wall clock at the first tick's rate, and journals
 * each command's fate in its own journal.
 */
class UnitProcessPlantClockTest {
    private static final String UNIT = "basin-steam-1";
    private static final long SCENARIO_MS = 1_800_000_000_000L;

    private final MessageCodec codec = new MessageCodec();
    private final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    private final InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
    private final InMemoryBus plant = broker.connect("demo-site-plant");
    private final TopicTree topics = TopicTree.forSite("demo-site");
    private long tickSeq = 100;

    @TempDir
    Path dir;

    private void tick(long scenarioMs, double rate, boolean running) {
        plant.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(++tickSeq, scenarioMs, scenarioMs - SCENARIO_MS,
                rate, running)), Qos.AT_MOST_ONCE, false, 0));
    }

    private UnitCommand pulse(long seq, long issuedAtMs, long validForMs) {
        return UnitCommand.pulse(seq, issuedAtMs, UNIT, InterfaceOptions.DEFAULT_CONTROLLER, SCENARIO_MS - 60_000,
                issuedAtMs + validForMs, PulseDirection.RAISE, 1_000);
    }

    @Test
    void shouldJudgeCommandExpiryOnThePlantsHeldAndSlowedScenarioTimeAfterTheFirstTick() throws Exception {
        Grid grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        BusClock clock = new BusClock(wall);
        clock.onTick(new ClockTick(tickSeq, SCENARIO_MS, 0, 40.0, true)); // as PlantClockFollower.await leaves it
        UnitProcess unit = new UnitProcess("demo-site", grid.units().get(grid.unitIndex(UNIT)), InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, broker::connect, clock);
        PlantClockFollower.feed(unit.bus(), topics, clock);
        PlantRunJournal journal = PlantRunJournal.create(dir, "unit-" + UNIT, clock.epochMillis(), Map.of(), clock, wall, 0);
        unit.journalTo(journal);
        UnitPlantInterface ui = unit.unitInterface();
        plant.publish(new OutboundMessage(topics.fieldReading(UNIT), codec.encode(new FieldReading(1, SCENARIO_MS, UNIT, 600,
                600, UnitStatus.ONLINE)), Qos.AT_MOST_ONCE, false, 0)); // the plant's physics serves the unit's turbine

        tick(SCENARIO_MS + 5_000, 40.0, false); // the plant's pace keeper holds its clock 5 s in
        wall.advanceMillis(3_000); // 3 wall s = 120 s of scenario time at the first tick's rate
        assertThat(clock.epochMillis()).as("held with the plant").isEqualTo(SCENARIO_MS + 5_000);
        ui.onCommand(pulse(1, SCENARIO_MS + 4_000, 4_000), clock.monotonicNanos()); // valid to +8 s: still valid
        assertThat(ui.acceptedCount()).as("accepted: only 5 s of scenario time went by " + ui.refusalCounts()).isEqualTo(1);

        tick(SCENARIO_MS + 5_000, 20.0, true); // runs on at half the rate
        for (int s = 1; s <= 8; s++) { // the plant's tick every scenario second: 50 wall ms apart at rate 20
            wall.advanceMillis(50);
            tick(SCENARIO_MS + 5_000 + s * 1_000L, 20.0, true);
        }
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 13_000);
        ui.onCommand(pulse(2, SCENARIO_MS + 6_000, 4_000), clock.monotonicNanos()); // valid to +10 s: expired at +13 s
        assertThat(ui.refusalCount(RefusalReason.EXPIRED)).as("expired on the plant's slowed time").isEqualTo(1);
        unit.close();
        journal.close(clock.epochMillis(), EndReason.STOPPED);

        // the unit process's own journal keeps both fates, the refusal with its reason code and figures
        List<JournalEntry> commands = JournalReader.readAll(dir.resolve("unit-" + UNIT + ".jsonl")).entries().stream()
                .filter(e -> e.kind().equals("command")).toList();
        assertThat(commands).extracting(e -> e.get("commandSeq").asLong() + " " + e.text("outcome") + " " + e.text("reason"))
                .containsExactly("1 accepted null", "2 rejected expired");
        assertThat(commands.get(1).text("detail")).contains("validUntil " + (SCENARIO_MS + 10_000));
    }

    @Test
    void shouldNotLeaveRemoteWhileItsOwnConnectionIsStalledAndCatchUpOnThePlantsTimeWithTheStatusesThatCame()
            throws Exception {
        List<JournalEntry> blind = stallOfTheUnitsConnection(BusClock.WhenSilent.RUN_BLIND);
        // the controller's clock would run on blind: 2 s + 1.5 s x 20 = 32 s without a status, the watchdog (30 s)
        assertThat(blind).extracting(e -> e.text("event")).contains("watchdog");

        List<JournalEntry> standing = stallOfTheUnitsConnection(BusClock.WhenSilent.STAND_STILL);
        assertThat(standing).extracting(e -> e.text("event")).containsExactly("clockSilent", "clockHeard");
        assertThat(standing.get(0).get("limitWallMs").asLong()).isEqualTo(2_000);
        assertThat(standing.get(0).text("unit")).isEqualTo(UNIT);
        assertThat(standing.get(1).get("silentWallMs").asLong()).isEqualTo(3_500);
    }

    @Test
    void shouldStampAStatusThatCameWhileItsTimeStoodWithThePlantsTimeOfTheNextTick() throws Exception {
        // seen on a broker cluster: the unit's own connection opened 1.3 s of wall time after the tick that set its
        // clock, a live status came on it before any tick, then the first tick 31 s further on
        assertThat(statusThenLateTick(true)).as("the status waited for the tick").isEqualTo(ControlMode.REMOTE);
        assertThat(statusThenLateTick(false)).as("stamped with the standing time").isEqualTo(ControlMode.LOCAL);
    }

    private ControlMode statusThenLateTick(boolean followed) throws Exception {
        Grid grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        InMemoryBroker bus = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        InMemoryBus plantSide = bus.connect("demo-site-plant-" + followed);
        BusClock clock = new BusClock(wall, BusClock.WhenSilent.STAND_STILL);
        clock.onTick(new ClockTick(++tickSeq, SCENARIO_MS, 0, 20.0, true)); // the tick taken before its own connection
        UnitProcess unit = new UnitProcess("demo-site", grid.units().get(grid.unitIndex(UNIT)), InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, bus::connect, clock);
        PlantClockFollower.feed(unit.bus(), topics, clock);
        if (followed) {
            unit.followPlantClock(clock);
        }
        plantSide.publish(new OutboundMessage(topics.fieldReading(UNIT), codec.encode(new FieldReading(1, SCENARIO_MS, UNIT,
                600, 600, UnitStatus.ONLINE)), Qos.AT_MOST_ONCE, false, 0));
        wall.advanceMillis(1_300);
        unit.agent().doWork();
        status(plantSide, 1, SCENARIO_MS + 30_000); // the controller's, live, at the plant's 30 s
        unit.agent().doWork();
        plantSide.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(++tickSeq, SCENARIO_MS + 33_000,
                33_000, 20.0, true)), Qos.AT_MOST_ONCE, false, 0));
        unit.agent().doWork();
        ControlMode mode = unit.unitInterface().controlMode();
        unit.close();
        return mode;
    }

    /**
     * A unit in remote (its watchdog armed, 30 s in the demo site) whose connection hears nothing for 3.5 s of
     * wall time at rate 20 while the plant and the controller run on, then gets the backlog in order: the plant's
     * ticks with the controller's statuses among them, one every 4 scenario seconds.
     *
     * @return the unit journal's events from the start of the stall on
     */
    private List<JournalEntry> stallOfTheUnitsConnection(BusClock.WhenSilent whenSilent) throws Exception {
        Grid grid = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        InMemoryBroker bus = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        InMemoryBus plantSide = bus.connect("demo-site-plant-" + whenSilent);
        BusClock clock = new BusClock(wall, whenSilent);
        clock.onTick(new ClockTick(tickSeq, SCENARIO_MS, 0, 20.0, true));
        UnitProcess unit = new UnitProcess("demo-site", grid.units().get(grid.unitIndex(UNIT)), InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, bus::connect, clock);
        PlantClockFollower.feed(unit.bus(), topics, clock);
        unit.followPlantClock(clock);
        Path folder = dir.resolve(whenSilent.name());
        PlantRunJournal journal = PlantRunJournal.create(folder, "unit-" + UNIT, clock.epochMillis(), Map.of(), clock, wall, 0);
        unit.journalTo(journal);
        UnitPlantInterface ui = unit.unitInterface();
        plantSide.publish(new OutboundMessage(topics.fieldReading(UNIT), codec.encode(new FieldReading(1, SCENARIO_MS, UNIT,
                600, 600, UnitStatus.ONLINE)), Qos.AT_MOST_ONCE, false, 0));
        long statusSeq = 1;
        for (int s = 1; s <= 8; s++) { // 8 scenario seconds at rate 20, a status every 4
            wall.advanceMillis(50);
            plantSide.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(++tickSeq, SCENARIO_MS + s * 1_000L,
                    s * 1_000L, 20.0, true)), Qos.AT_MOST_ONCE, false, 0));
            if (s % 4 == 0) {
                statusSeq = status(plantSide, statusSeq, SCENARIO_MS + s * 1_000L);
            }
            unit.agent().doWork();
        }
        assertThat(ui.controlMode()).isEqualTo(ControlMode.REMOTE);
        assertThat(ui.heartbeatAgeNanos(clock.monotonicNanos())).as("watchdog armed").isNotNegative();
        long stallFromMs = clock.epochMillis();
        for (int w = 0; w < 35; w++) { // 3.5 s of wall without a message, the unit's agent running on
            wall.advanceMillis(100);
            unit.agent().doWork();
        }
        for (int s = 9; s <= 78; s++) { // the backlog: 70 scenario seconds the plant ran meanwhile, in order
            plantSide.publish(new OutboundMessage(topics.clock(), codec.encode(new ClockTick(++tickSeq, SCENARIO_MS + s * 1_000L,
                    s * 1_000L, 20.0, true)), Qos.AT_MOST_ONCE, false, 0));
            if (s % 4 == 0) {
                statusSeq = status(plantSide, statusSeq, SCENARIO_MS + s * 1_000L);
            }
            unit.agent().doWork();
        }
        unit.agent().doWork();
        unit.close();
        journal.close(clock.epochMillis(), EndReason.STOPPED);
        return JournalReader.readAll(folder.resolve("unit-" + UNIT + ".jsonl")).entries().stream()
                .filter(e -> e.kind().equals("event") && e.tMs() >= stallFromMs).toList();
    }

    private long status(InMemoryBus from, long seq, long atMs) {
        from.publish(new OutboundMessage(topics.controllerStatus(InterfaceOptions.DEFAULT_CONTROLLER), codec.encode(
                new ControllerStatus(seq, atMs, InterfaceOptions.DEFAULT_CONTROLLER, 1, ControllerState.REGULATING, List.of(), seq,
                        List.of())), Qos.AT_LEAST_ONCE, true, 0));
        return seq + 1;
    }
}
