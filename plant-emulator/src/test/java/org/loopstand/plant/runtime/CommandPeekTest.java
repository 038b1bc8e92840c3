package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.RefusalReason;

class CommandPeekTest {
    @Test
    void shouldNameAnInvalidControllerIdUnknownSoTheRefusalAckStillEncodes() {
        for (String bad : List.of("\"bad id!\"", "\"\"", "\"" + "x".repeat(200) + "\"", "17")) {
            byte[] payload = ("{\"seq\":42,\"controllerId\":" + bad + ",\"unit\":\"u1\"}").getBytes(StandardCharsets.UTF_8);
            CommandPeek.Peeked p = CommandPeek.peek(payload);
            assertThat(p.controllerId()).as(bad).isEqualTo(CommandPeek.UNKNOWN_CONTROLLER);
            assertThat(p.seq()).isEqualTo(42);
            CommandAck ack = new CommandAck(1, 1_700_000_000_000L, "u1", p.seq(), p.controllerId(), AckOutcome.REJECTED,
                    RefusalReason.MALFORMED, "payload refused by the codec");
            assertThat(new MessageCodec().decode(new MessageCodec().encode(ack), CommandAck.class).message()).isPresent();
        }
    }
}
