package org.loopstand.plant.check;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

class RunRecordControllersTest {
    private static final long T0 = 1_700_000_000_000L;

    private static UnitCommand pulse(long seq, String controller) {
        return UnitCommand.pulse(seq, T0, "u1", controller, T0, T0 + 4_000, PulseDirection.RAISE, 500);
    }

    @Test
    void shouldCountTheCommandsTakenPerSendingControllerSoAThirdPartyShows() {
        RunRecord run = new RunRecord(T0);
        run.commandHandled(T0, pulse(1, "controller-1"), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0, pulse(2, "controller-1"), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0, pulse(1, "third-party"), AckOutcome.ACCEPTED, null, true);
        run.commandHandled(T0, pulse(2, "third-party"), AckOutcome.REJECTED, RefusalReason.WRONG_CONTROLLER, false);
        assertThat(run.acceptedByController()).containsExactly(
                java.util.Map.entry("controller-1", 2L), java.util.Map.entry("third-party", 1L));
    }
}
