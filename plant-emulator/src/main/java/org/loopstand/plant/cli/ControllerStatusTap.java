package org.loopstand.plant.cli;

import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;

/**
 * The controller's statuses as the plant sees them, on the plant connection: journaled at arrival
 * (its heartbeat and own ACE for the report) and, when the scenario has checks, fed into the run
 * record on the plant loop's thread (the checks on its decisions).
 */
public final class ControllerStatusTap {
    private ControllerStatusTap() {
    }

    /**
     * @param journal where statuses are journaled, may be null
     * @param record  the run record the checks read, or null when the run decides no checks
     */
    public static void subscribe(PlantRunner runner, Clock clock, PlantRunJournal journal, RunRecord record) {
        if (journal == null && record == null) {
            return;
        }
        MessageCodec codec = new MessageCodec();
        runner.plantBus().subscribe(runner.topics().filterAll(TopicKind.CONTROLLER_STATUS), Qos.AT_LEAST_ONCE, m -> {
            long at = clock.epochMillis();
            codec.decode(m.payload(), ControllerStatus.class).message().ifPresent(st -> {
                if (journal != null) {
                    journal.controllerStatus(at, st);
                }
                if (record != null) {
                    runner.agent().runOnLoop(() -> record.controllerStatus(at, st));
                }
            });
        });
    }
}
