package org.loopstand.bench.jmh;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.intake.IntakeRouter;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.VirtualClock;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Codec and intake path per message: encode and decode of one unit telemetry, and the controller's
 * {@link IntakeRouter#route} (topic parse, decode, validation, store) for the same payload. Run by
 * hand (docs/performance.md) with {@code -prof gc} for the allocation per operation.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class CodecAndIntakeBenchmark {
    private final MessageCodec codec = new MessageCodec();
    private UnitTelemetry telemetry;
    private byte[] payload;
    private IntakeRouter router;
    private String topic;
    private long seq = 1;
    private long nowMs = 1_700_000_000_000L;

    @Setup
    public void setup() throws Exception {
        Path dir = Files.createTempDirectory("jmh-site");
        Path f = SiteGenerator.write(dir.resolve("s.yaml"), "jmh", 100, 2, 4);
        ControllerSiteConfig site = ControllerSiteReader.read(f);
        router = new IntakeRouter(site, new VirtualClock(nowMs), codec, null);
        String unit = SiteGenerator.unit(0, 0);
        topic = "loopstand/v1/jmh/unit/" + unit + "/telemetry";
        telemetry = sample(unit, seq, nowMs);
        payload = codec.encode(telemetry);
    }

    private static UnitTelemetry sample(String unit, long seq, long t) {
        return new UnitTelemetry(seq, t, unit, 100.5 + (seq % 7) * 0.1, Quality.GOOD, 100.0, UnitStatus.ONLINE,
                ControlMode.REMOTE, 50, 140, 10, 10, true, 0);
    }

    @Benchmark
    public byte[] encodeTelemetry() {
        return codec.encode(telemetry);
    }

    @Benchmark
    public Object decodeTelemetry() {
        return codec.decode(payload, UnitTelemetry.class);
    }

    /** Decode + validate + store, as the controller does for every telemetry message. */
    @Benchmark
    public long routeTelemetry() {
        seq++;
        nowMs += 1000;
        byte[] p = codec.encode(sample(telemetry.unit(), seq, nowMs)); // fresh seq/time so the sample is used
        router.route(topic, p, nowMs);
        return router.messagesRouted();
    }

    /** The part of {@link #routeTelemetry} that is not routing: subtract it. */
    @Benchmark
    public byte[] encodeFreshTelemetry() {
        seq++;
        nowMs += 1000;
        return codec.encode(sample(telemetry.unit(), seq, nowMs));
    }
}
