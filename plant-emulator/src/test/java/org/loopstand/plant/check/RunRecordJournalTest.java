package org.loopstand.plant.check;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.RehearsalStudy;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.VirtualClock;

/** Checks decided again from the journal alone come out exactly as they did during the run. */
class RunRecordJournalTest {
    @TempDir
    Path dir;

    @Test
    void shouldDecideTheSameChecksFromTheJournal() throws Exception {
        Path config = Path.of("..", "config");
        Grid grid = SiteLoader.load(config.resolve("sites/demo-site.yaml"));
        RunScenario rs = RunScenarioLoader.load(config.resolve("scenarios/rehearse-meter-freeze.yaml"), EventTypeRegistry.physics(), grid);
        Path file = dir.resolve("plant.jsonl");
        RehearsalStudy.Result during;
        try (JournalWriter journal = JournalWriter.create(file, "plant", RehearsalStudy.START_EPOCH_MS, new VirtualClock(0))) {
            during = new RehearsalStudy(grid, rs, 1.0, c -> {
                c.record().mirrorTo(journal);
                return List.of(new FakeController(c));
            }, FaultObserver.NONE).run();
        }
        // both fake pulses were issued inside the stale interval [160, 420) s (at 200 s and 280 s); suspended 30 s after 120 s
        assertThat(during.outcome("no-pulse-on-frozen-meter").decidingFigure()).isEqualTo(2);
        assertThat(during.outcome("controller-suspends").decidingFigure()).isEqualTo(30);
        RunRecord again = RunRecordJournal.read(file, RehearsalStudy.START_EPOCH_MS);
        List<CheckOutcome> replayed = rs.checks().stream().map(c -> c.evaluate(again, grid)).toList();
        assertThat(replayed).isEqualTo(during.outcomes());
        assertThat(again.commands()).isEqualTo(during.record().commands());
        assertThat(again.faults()).isEqualTo(during.record().faults());
    }

    /** Sends one pulse at 200 s (acked accepted) and one expired-refused at 300 s, reports suspended at 150 s. */
    private static final class FakeController implements Agent {
        private final RehearsalStudy.Context c;
        private int done;

        FakeController(RehearsalStudy.Context c) {
            this.c = c;
        }

        @Override
        public int doWork() {
            long now = c.clock().epochMillis();
            double s = c.faults().nowS();
            if (done == 0 && s >= 150) {
                c.record().controllerStatus(now, new ControllerStatus(1, now, "agc-1", 1, ControllerState.SUSPENDED,
                        List.of("north-basin frequency frozen"), 37, List.of()));
                done++;
            } else if (done == 1 && s >= 200) {
                c.record().commandHandled(now, UnitCommand.pulse(1, now, "basin-steam-1", "agc-1", 1, now + 8000,
                        PulseDirection.RAISE, 2000), AckOutcome.ACCEPTED, null, true);
                done++;
            } else if (done == 2 && s >= 300) {
                c.record().commandHandled(now, UnitCommand.pulse(2, now - 20_000, "basin-steam-1", "agc-1", 1, now - 12_000,
                        PulseDirection.LOWER, 2000), AckOutcome.REJECTED, RefusalReason.EXPIRED, false);
                done++;
            }
            return 0;
        }

        @Override
        public String roleName() {
            return "fake-controller";
        }
    }
}
