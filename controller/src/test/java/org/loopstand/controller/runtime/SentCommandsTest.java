package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.CommandAck;

class SentCommandsTest {
    private static PlannedCommand command(String unit) {
        return new PlannedCommand(unit, CommandKind.PULSE, PulseDirection.RAISE, 1_000, Double.NaN, 1.0, 0, 8_000);
    }

    private static CommandAck ack(String unit, long commandSeq, String controller) {
        return new CommandAck(1, 1_700_000_000_000L, unit, commandSeq, controller, AckOutcome.ACCEPTED, null, null);
    }

    @Test
    void shouldMatchOnlyAcksForCommandsThisControllerSentAndOnlyOnce() {
        SentCommands sent = new SentCommands("controller-1", null);
        sent.sent(1, command("u1"));
        sent.sent(2, command("u2"));
        assertThat(sent.match(ack("u1", 1, "controller-1"), 0)).isNotNull();
        assertThat(sent.match(ack("u1", 1, "controller-1"), 0)).as("second ack for seq 1").isNull();
        assertThat(sent.match(ack("u1", 2, "controller-1"), 0)).as("seq 2 went to u2").isNull();
        assertThat(sent.match(ack("u2", 2, "pulse-test"), 0)).as("another controller's").isNull();
        assertThat(sent.match(ack("u9", 77, "controller-1"), 0)).as("never sent").isNull();
        assertThat(sent.match(ack("u2", 2, "controller-1"), 0)).isNotNull();
        assertThat(sent.matchedCount()).isEqualTo(2);
        assertThat(sent.unknownCount()).isEqualTo(4);
        assertThat(sent.awaitedCount()).isZero();
    }

    @Test
    void shouldBoundTheCommandsAwaitingAnAck() {
        SentCommands sent = new SentCommands("controller-1", null);
        for (long seq = 1; seq <= SentCommands.MAX_AWAITED + 10; seq++) {
            sent.sent(seq, command("u1"));
        }
        assertThat(sent.awaitedCount()).isEqualTo(SentCommands.MAX_AWAITED);
        assertThat(sent.forgottenCount()).isEqualTo(10);
        assertThat(sent.match(ack("u1", 1, "controller-1"), 0)).isNull();
        assertThat(sent.match(ack("u1", 11, "controller-1"), 0)).isNotNull();
    }
}
