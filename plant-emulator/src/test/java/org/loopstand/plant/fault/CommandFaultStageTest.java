package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;

class CommandFaultStageTest {
    private final FaultRig rig = new FaultRig();
    private final List<UnitCommand> delivered = new ArrayList<>();
    private final List<String> fates = new ArrayList<>();
    private final CommandFaultStage stage = new CommandFaultStage(FaultRig.UNIT, rig.engine, rig.clock, delivered::add,
            new FaultObserver() {
                @Override
                public void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
                    fates.add(command.seq() + ":" + fate + faultIds);
                }
            }, 3, 100);

    private UnitCommand pulse(long seq) {
        long now = rig.clock.epochMillis();
        return UnitCommand.pulse(seq, now, FaultRig.UNIT, "agc-1", 1, now + 8000, PulseDirection.RAISE, 2000);
    }

    /** Offers one command per second for {@code count} seconds, then runs 20 s more. */
    private void drive(int count) {
        for (int i = 0; i < count + 20; i++) {
            rig.engine.update();
            stage.doWork();
            if (i < count) {
                stage.offer(pulse(i + 1));
            }
            rig.clock.advanceMillis(1000);
        }
    }

    @Test
    void shouldDropCommandsInTheWindow() {
        rig.fault("c1", "commandDrop", FaultRig.UNIT, Map.of(), 3, 6);
        drive(10);
        assertThat(delivered).extracting(UnitCommand::seq).containsExactly(1L, 2L, 3L, 7L, 8L, 9L, 10L);
        assertThat(fates).contains("4:dropped[c1]", "6:dropped[c1]", "7:passed[]");
    }

    @Test
    void shouldDelayCommandsPastTheirExpiry() {
        rig.fault("c1", "commandDelay", FaultRig.UNIT, Map.of("delayMs", 9000), 0, 3);
        List<Long> deliveredAtMs = new ArrayList<>();
        CommandFaultStage timed = new CommandFaultStage(FaultRig.UNIT, rig.engine, rig.clock,
                c -> deliveredAtMs.add(rig.clock.epochMillis() - c.validUntil()), FaultObserver.NONE, 3, 100);
        for (int i = 0; i < 20; i++) {
            rig.engine.update();
            timed.doWork();
            if (i < 5) {
                timed.offer(pulse(i + 1));
            }
            rig.clock.advanceMillis(1000);
        }
        // the last two pass at once (8 s left); the first three waited 9 s on an 8 s validity: 1 s past validUntil
        assertThat(deliveredAtMs).containsExactly(-8000L, -8000L, 1000L, 1000L, 1000L);
    }

    @Test
    void shouldDuplicateCommands() {
        rig.fault("c1", "commandDuplicate", FaultRig.UNIT, Map.of("copies", 2), 0, 2);
        drive(4);
        assertThat(delivered).extracting(UnitCommand::seq).containsExactly(1L, 1L, 1L, 2L, 2L, 2L, 3L, 4L);
        assertThat(fates).contains("1:duplicated[c1]");
    }

    @Test
    void shouldLeaveCommandsToOtherUnitsAlone() {
        rig.fault("c1", "commandDrop", "basin-steam-1", Map.of(), 0, 100);
        drive(3);
        assertThat(delivered).hasSize(3);
    }
}
