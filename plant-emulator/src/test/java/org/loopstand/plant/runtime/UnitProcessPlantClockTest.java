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
}
