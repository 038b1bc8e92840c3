package org.loopstand.protocol.codec;

import java.util.List;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * Rough single-thread throughput of encode and decode (not a unit test, no assertion on time).
 * Run: see docs/performance.md. Figures there, not in tests: the machine is shared and noisy.
 */
public final class CodecThroughputMain {
    private CodecThroughputMain() {
    }

    public static void main(String[] args) {
        int rounds = args.length > 0 ? Integer.parseInt(args[0]) : 200_000;
        MessageCodec codec = new MessageCodec();
        Clock clock = WallClock.INSTANCE;
        for (Object message : List.of(MessageCodecRejectionTest.METER, MessageCodecRejectionTest.PULSE)) {
            byte[] bytes = codec.encode(message);
            long sink = 0;
            for (int i = 0; i < rounds / 4; i++) { // warm-up
                sink += codec.encode(message).length;
                sink += codec.decode(bytes, message.getClass()).isOk() ? 1 : 0;
            }
            long start = clock.monotonicNanos();
            for (int i = 0; i < rounds; i++) {
                sink += codec.encode(message).length;
            }
            long encoded = clock.monotonicNanos();
            for (int i = 0; i < rounds; i++) {
                sink += codec.decode(bytes, message.getClass()).isOk() ? 1 : 0;
            }
            long decoded = clock.monotonicNanos();
            System.out.printf("%s (%d bytes): encode %.2f us, decode %.2f us per message (sink %d)%n",
                    message.getClass().getSimpleName(), bytes.length, (encoded - start) / 1e3 / rounds,
                    (decoded - encoded) / 1e3 / rounds, sink);
        }
    }
}
