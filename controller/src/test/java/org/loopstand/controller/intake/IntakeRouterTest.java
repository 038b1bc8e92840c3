package org.loopstand.controller.intake;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/** The intake from real encoded wire messages to validated inputs. */
class IntakeRouterTest {
    private static final long T0 = 1_700_000_000_000L;
    private final MessageCodec codec = new MessageCodec();
    private final TopicTree topics = TopicTree.forSite("s1");
    private final List<String> skews = new ArrayList<>();
    private final List<String> rejections = new ArrayList<>();

    private IntakeRouter router(String intake) {
        ControllerSiteConfig cfg = ControllerSiteReader.read("s1.yaml", """
                siteId: s1
                areas:
                  - {id: a1, nominalFrequencyHz: 50, kMwPerHz: 400}
                  - {id: a2, nominalFrequencyHz: 50, kMwPerHz: 300}
                ties:
                  - {id: t12, fromArea: a1, toArea: a2, scheduledFlowMw: 50}
                units:
                  - {id: u1, area: a1, ratingMw: 500}
                controller:
                  intake:
                %s
                """.formatted(intake.indent(4)));
        return new IntakeRouter(cfg, new VirtualClock(T0), codec, new IntakeObserver() {
            @Override
            public void onRejected(String topic, String reason, String detail) {
                rejections.add(reason);
            }

            @Override
            public void onClockSkew(String source, long skewMs) {
                skews.add(source + "=" + skewMs);
            }
        });
    }

    private void meter(IntakeRouter r, String area, String meter, long seq, long sourceMs, double hz, Quality q,
                       double tieMw, long receivedMs) {
        AreaMeter m = new AreaMeter(seq, sourceMs, area, meter, hz, q, List.of(new TieFlow("t12", tieMw, Quality.GOOD)),
                tieMw, Quality.GOOD);
        r.route(topics.areaMeter(area, meter), codec.encode(m), receivedMs);
    }

    @Test
    void shouldCountDecodeRejectionsPerReasonWithoutThrowing() {
        IntakeRouter r = router("clockSkewLimitMs: 2000");
        r.route(topics.areaMeter("a1", "m1"), "{not json".getBytes(StandardCharsets.UTF_8), T0);
        r.route(topics.areaMeter("a1", "m1"), "{\"seq\":1}".getBytes(StandardCharsets.UTF_8), T0);
        r.route("some/other/topic", new byte[0], T0);
        meter(r, "zz", "m1", 1, T0, 50, Quality.GOOD, 0, T0);
        assertThat(r.rejectedByReason()).containsEntry("MALFORMED", 1L).containsEntry("MISSING_FIELD", 1L)
                .containsEntry("unknownTopic", 1L).containsEntry("unknownArea", 1L);
        assertThat(rejections).hasSize(4);
        assertThat(r.areaInputs("a1", T0).frequencyHz().reasons()).contains(ValidationReason.NO_DATA);
    }

    @Test
    void shouldHoldAStaleFrequencyForItsHoldTimeThenDeclareItUnusable() {
        IntakeRouter r = router("frequency: {maxAgeMs: 10000, policy: holdLastGood, holdMs: 8000}");
        meter(r, "a1", "m1", 1, T0, 49.98, Quality.GOOD, 60, T0 + 50);
        assertThat(r.areaInputs("a1", T0 + 9_000).frequencyHz().usable()).isTrue();
        ValidatedValue held = r.areaInputs("a1", T0 + 15_000).frequencyHz();
        assertThat(held.usable()).isTrue();
        assertThat(held.held()).isTrue();
        assertThat(held.reasons()).contains(ValidationReason.STALE, ValidationReason.HELD_LAST_GOOD);
        ValidatedValue gone = r.areaInputs("a1", T0 + 18_001).frequencyHz();
        assertThat(gone.usable()).isFalse();
        assertThat(gone.reasons()).contains(ValidationReason.HOLD_EXPIRED);
    }

    @Test
    void shouldRefuseBadQualityAndFrozenValues() {
        IntakeRouter r = router("frequency: {policy: declareUnusable, frozenAfterMs: 2000, frozenMinReadings: 3, frozenEpsilonHz: 0.0}");
        meter(r, "a1", "m1", 1, T0, 49.99, Quality.of(Validity.INVALID, QualityFlag.FAILURE), 0, T0);
        assertThat(r.areaInputs("a1", T0).frequencyHz().reasons()).contains(ValidationReason.BAD_QUALITY);
        assertThat(r.areaInputs("a1", T0).frequencyHz().usable()).isFalse();
        meter(r, "a1", "m1", 2, T0 + 1000, 50.01, Quality.GOOD, 0, T0 + 1000);
        meter(r, "a1", "m1", 3, T0 + 2000, 50.01, Quality.GOOD, 0, T0 + 2000);
        assertThat(r.areaInputs("a1", T0 + 2000).frequencyHz().usable()).isTrue();
        meter(r, "a1", "m1", 4, T0 + 3000, 50.01, Quality.GOOD, 0, T0 + 3000);
        ValidatedValue v = r.areaInputs("a1", T0 + 3000).frequencyHz();
        assertThat(v.usable()).isFalse();
        assertThat(v.reasons()).contains(ValidationReason.FROZEN);
    }

    @Test
    void shouldNoteSeqGapsAndDropDuplicatesAndOutOfOrderSamples() {
        IntakeRouter r = router("frequency: {policy: declareUnusable}");
        meter(r, "a1", "m1", 5, T0, 50.00, Quality.GOOD, 0, T0);
        meter(r, "a1", "m1", 8, T0 + 1000, 50.02, Quality.GOOD, 0, T0 + 1000);
        ValidatedValue v = r.areaInputs("a1", T0 + 1000).frequencyHz();
        assertThat(v.reasons()).contains(ValidationReason.SEQ_GAP);
        assertThat(v.value()).isEqualTo(50.02);
        meter(r, "a1", "m1", 8, T0 + 2000, 49.00, Quality.GOOD, 0, T0 + 2000);
        meter(r, "a1", "m1", 6, T0 + 2000, 49.00, Quality.GOOD, 0, T0 + 2000);
        assertThat(r.areaInputs("a1", T0 + 2000).frequencyHz().value()).isEqualTo(50.02);
        SeqTracker seq = r.frequencyInput("a1").primary().seqTracker();
        assertThat(seq.missingCount()).isEqualTo(2);
        assertThat(seq.duplicateCount()).isEqualTo(1);
        assertThat(seq.outOfOrderCount()).isEqualTo(1);
    }

    @Test
    void shouldKeepUsingAMetersRealScansAfterOneReadingWithAHugeSeqJump() {
        IntakeRouter r = router("frequency: {policy: declareUnusable}");
        meter(r, "a1", "m1", 1, T0, 50.00, Quality.GOOD, 0, T0);
        meter(r, "a1", "m1", 1 + 1_000_000_000L, T0 + 500, 50.00, Quality.GOOD, 0, T0 + 500);
        for (int i = 2; i <= 20; i++) {
            // real scans move a little (19 identical values would be a frozen meter, refused on its own)
            meter(r, "a1", "m1", i, T0 + i * 1000L, 50.00 + i * 0.0005, Quality.GOOD, 0, T0 + i * 1000L);
        }
        ValidatedValue v = r.areaInputs("a1", T0 + 20_000).frequencyHz();
        assertThat(v.usable()).isTrue();
        assertThat(v.value()).isCloseTo(50.01, org.assertj.core.api.Assertions.within(1e-9));
        SeqTracker seq = r.frequencyInput("a1").primary().seqTracker();
        assertThat(seq.outOfOrderCount()).isZero();
        assertThat(seq.missingCount()).isZero();
        assertThat(seq.revokedJumpCount()).isEqualTo(1);
    }

    @Test
    void shouldLetANewerScheduleReplaceAnOldRetainedOneWithALaterEffectiveFrom() {
        IntakeRouter r = router("clockSkewLimitMs: 2000");
        // left retained by an earlier run: 300 MW from T0 + 60 s
        r.route(topics.areaSchedule("a1"), codec.encode(new Schedule(7, T0 - 3_600_000, "a1", 300, 50, T0 + 60_000)), T0);
        // this run's schedule, received after it: 100 MW from now
        r.route(topics.areaSchedule("a1"), codec.encode(new Schedule(1, T0, "a1", 100, 50, T0)), T0 + 10);
        assertThat(r.schedule("a1", T0 + 1_000).netInterchangeScheduledMw()).isEqualTo(100);
        assertThat(r.schedule("a1", T0 + 120_000).netInterchangeScheduledMw()).isEqualTo(100);
    }

    @Test
    void shouldKeySkewEventsByAreaAndMeterSoTwoAreasMainMetersStayApart() {
        IntakeRouter r = router("clockSkewLimitMs: 2000");
        meter(r, "a1", "main", 1, T0 + 5_000, 50.0, Quality.GOOD, 0, T0);
        meter(r, "a2", "main", 1, T0 + 6_000, 50.0, Quality.GOOD, 0, T0);
        assertThat(skews).containsExactly("meter:a1/main=5000", "meter:a2/main=6000");
    }

    @Test
    void shouldDetectAndReportClockSkewOfASourceAhead() {
        IntakeRouter r = router("clockSkewLimitMs: 2000\nfrequency: {policy: declareUnusable}");
        meter(r, "a1", "m1", 1, T0 + 5_000, 50.0, Quality.GOOD, 0, T0);
        ValidatedValue v = r.areaInputs("a1", T0).frequencyHz();
        assertThat(v.usable()).isFalse();
        assertThat(v.reasons()).contains(ValidationReason.CLOCK_SKEW_AHEAD);
        assertThat(skews).containsExactly("meter:a1/m1=5000");
        assertThat(r.frequencyInput("a1").primary().maxClockSkewAheadMs()).isEqualTo(5000);
    }

    /**
     * Replayed at rate 40, a source 5 s of scenario time ahead is 125 ms of wall time ahead: transport and
     * the extrapolation of the plant's clock, not a wrong clock. The limit follows the rate the plant's
     * clock announces (2000 ms · 40 = 80 s); at rate 1 the same reading is refused as before.
     */
    @Test
    void shouldScaleTheClockSkewLimitWithTheReplayRate() {
        IntakeRouter r = router("clockSkewLimitMs: 2000\nfrequency: {policy: declareUnusable}");
        r.route(topics.clock(), codec.encode(new ClockTick(1, T0, 0, 40.0, true)), T0);
        assertThat(r.frequencyInput("a1").primary().clockSkewLimitMs()).isEqualTo(80_000);
        meter(r, "a1", "m1", 1, T0 + 5_000, 50.0, Quality.GOOD, 0, T0);
        assertThat(r.areaInputs("a1", T0).frequencyHz().usable()).isTrue();
        assertThat(r.telemetryCheck("u1").clockSkewLimitMs()).isEqualTo(80_000);
        assertThat(r.tieFlowInput("a1", "t12").primary().clockSkewLimitMs()).isEqualTo(80_000);
        r.route(topics.clock(), codec.encode(new ClockTick(2, T0, 0, 1.0, true)), T0);
        meter(r, "a1", "m1", 2, T0 + 5_000 + 2_000, 50.0, Quality.GOOD, 0, T0);
        assertThat(r.areaInputs("a1", T0).frequencyHz().reasons()).contains(ValidationReason.CLOCK_SKEW_AHEAD);
    }

    @Test
    void shouldTakeATieFlowFromTheOtherEndsMeterWithItsSignFlipped() {
        IntakeRouter r = router("tieFlow: {policy: alternateSource}\nfrequency: {policy: alternateSource}");
        meter(r, "a1", "m1", 1, T0, 50.0, Quality.GOOD, 58.0, T0);
        meter(r, "a2", "m2", 1, T0, 50.0, Quality.GOOD, -58.5, T0);
        // a1's own meter then falls silent; 12 s later a2's meter still reports the tie
        meter(r, "a2", "m2", 2, T0 + 12_000, 50.0, Quality.GOOD, -61.0, T0 + 12_000);
        AreaCycleInputs in = r.areaInputs("a1", T0 + 12_500);
        ValidatedValue tie = in.tieFlowsMw().get("t12");
        assertThat(tie.usable()).isTrue();
        assertThat(tie.value()).isEqualTo(61.0);
        assertThat(tie.reasons()).contains(ValidationReason.STALE, ValidationReason.ALTERNATE_SOURCE);
        // and the site's schedule stands in until one is received: a1 exports 50 MW
        assertThat(in.schedule().netInterchangeScheduledMw()).isEqualTo(50.0);
        assertThat(r.areaInputs("a2", T0).schedule().netInterchangeScheduledMw()).isEqualTo(-50.0);
    }

    @Test
    void shouldMarkAUnitWithStaleTelemetryAsNotGood() {
        IntakeRouter r = router("unitTelemetryMaxAgeMs: 5000");
        UnitTelemetry t = new UnitTelemetry(1, T0, "u1", 300, Quality.GOOD, 300, UnitStatus.ONLINE, ControlMode.REMOTE,
                100, 450, 30, 20, false, 0);
        r.route(topics.unitTelemetry("u1"), codec.encode(t), T0);
        assertThat(r.unitStates(T0 + 1000)).singleElement().satisfies(u -> {
            assertThat(u.telemetryGood()).isTrue();
            assertThat(u.inRemote()).isTrue();
            assertThat(u.areaId()).isEqualTo("a1");
        });
        assertThat(r.unitStates(T0 + 6000)).singleElement().satisfies(u -> assertThat(u.telemetryGood()).isFalse());
    }
}
