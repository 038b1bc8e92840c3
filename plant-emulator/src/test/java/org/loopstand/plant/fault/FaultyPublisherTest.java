package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;

/**
 * Each publication fault against what reaches the bus, with the truth beside it. Scans every 2 s;
 * fault windows [10, 30) s cover scans 5 to 14.
 */
class FaultyPublisherTest {
    private static final long PERIOD_MS = 2000;
    private static final int SCANS = 25;

    private static FaultRig runWith(String type, String target, Map<String, ?> params) {
        FaultRig rig = new FaultRig();
        rig.fault("f1", type, target, params, 10, 30);
        rig.run(SCANS, PERIOD_MS);
        assertTruthIntact(rig);
        return rig;
    }

    /** The faults never reach the physics: the truth is the same as in a run without faults. */
    private static void assertTruthIntact(FaultRig rig) {
        FaultRig clean = new FaultRig();
        clean.run(SCANS, PERIOD_MS);
        assertThat(rig.truthMeters).isEqualTo(clean.truthMeters);
        // every truth record was told beside its publication(s), unchanged (duplicates share one truth)
        assertThat(rig.meterPublications().stream().map(p -> (AreaMeter) p.truth()).distinct()
                .sorted(java.util.Comparator.comparingLong(AreaMeter::seq)).toList()).isEqualTo(rig.truthMeters);
    }

    private static boolean inWindow(AreaMeter m) {
        long t = m.sourceTime() - FaultRig.START_MS;
        return t >= 10_000 && t < 30_000;
    }

    @Test
    void shouldDropEveryMessageInTheWindowWithProbabilityOne() {
        FaultRig rig = runWith("drop", "north-basin", Map.of("dropProbability", 1.0));
        assertThat(rig.sentMeters()).hasSize(SCANS - 10).noneMatch(FaultyPublisherTest::inWindow);
        assertThat(rig.meterPublications()).filteredOn(p -> p.fate().equals(Publication.DROPPED)).hasSize(10)
                .allMatch(p -> p.faultIds().equals(List.of("f1")));
        assertThat(rig.sentTelemetry()).hasSize(SCANS); // the unit's telemetry is another target
    }

    @Test
    void shouldDropAboutTheGivenShareOfMessages() {
        FaultRig rig = new FaultRig();
        rig.fault("f1", "drop", "north-basin", Map.of("dropProbability", 0.5), 0, 2000);
        rig.run(400, PERIOD_MS);
        long dropped = rig.meterPublications().stream().filter(p -> p.fate().equals(Publication.DROPPED)).count();
        // binomial(400, 0.5): mean 200, sd 10; ±50 is five standard deviations
        assertThat(dropped).isBetween(150L, 250L);
    }

    @Test
    void shouldLoseMessagesInBurstsOfTheGivenLength() {
        FaultRig rig = new FaultRig();
        rig.fault("f1", "burstLoss", "north-basin", Map.of("burstStartProbability", 0.1, "burstLengthMessages", 4), 0, 2000);
        rig.run(300, PERIOD_MS);
        List<Boolean> lost = rig.meterPublications().stream().map(p -> p.fate().equals(Publication.DROPPED)).toList();
        int run = 0;
        List<Integer> runs = new java.util.ArrayList<>();
        for (boolean l : lost) {
            if (l) {
                run++;
            } else if (run > 0) {
                runs.add(run);
                run = 0;
            }
        }
        assertThat(runs).isNotEmpty().allMatch(r -> r % 4 == 0); // back-to-back bursts join into multiples
    }

    @Test
    void shouldPublishNothingDuringABlackout() {
        FaultRig rig = runWith("blackout", "basin-gas-1", Map.of());
        assertThat(rig.sentTelemetry()).hasSize(SCANS - 10)
                .noneMatch(t -> t.sourceTime() - FaultRig.START_MS >= 10_000 && t.sourceTime() - FaultRig.START_MS < 30_000);
        assertThat(rig.sentMeters()).hasSize(SCANS);
    }

    @Test
    void shouldFreezeTheValuesWhileTimestampsAdvanceAndQualityStaysGood() {
        FaultRig rig = runWith("freezeValue", "north-basin", Map.of());
        List<AreaMeter> window = rig.sentMeters().stream().filter(FaultyPublisherTest::inWindow).toList();
        AreaMeter before = rig.truthMeters.get(4); // last truth before the fault
        assertThat(window).hasSize(10).allSatisfy(m -> {
            assertThat(m.frequencyHz()).isEqualTo(before.frequencyHz());
            assertThat(m.ties()).isEqualTo(before.ties());
            assertThat(m.frequencyQuality().validity()).isEqualTo(Validity.GOOD);
        });
        assertThat(window).extracting(AreaMeter::sourceTime).isSorted().doesNotHaveDuplicates();
        assertThat(window).extracting(AreaMeter::seq).doesNotHaveDuplicates();
        // while the truth moved
        assertThat(rig.truthMeters.subList(5, 15)).extracting(AreaMeter::frequencyHz).doesNotHaveDuplicates();
        assertThat(rig.sentMeters().get(15).frequencyHz()).isEqualTo(rig.truthMeters.get(15).frequencyHz());
    }

    @Test
    void shouldStopTheTimestampButKeepValuesLive() {
        FaultRig rig = runWith("freezeTimestamp", "north-basin", Map.of());
        List<AreaMeter> sent = rig.sentMeters();
        assertThat(sent.subList(5, 15)).extracting(AreaMeter::sourceTime).containsOnly(rig.truthMeters.get(4).sourceTime());
        assertThat(IntStream.range(5, 15).mapToObj(i -> sent.get(i).frequencyHz()).toList())
                .isEqualTo(IntStream.range(5, 15).mapToObj(i -> rig.truthMeters.get(i).frequencyHz()).toList());
    }

    @Test
    void shouldRepeatTheLastMessageByteForByte() {
        FaultRig rig = runWith("repeatLast", "north-basin", Map.of());
        byte[] last = rig.bus.sent.stream().filter(m -> m.topic().contains("/meter/")).toList().get(4).payload();
        assertThat(rig.bus.sent.stream().filter(m -> m.topic().contains("/meter/")).toList().subList(5, 15))
                .allSatisfy(m -> assertThat(m.payload()).isEqualTo(last));
    }

    @Test
    void shouldDelayMessagesByTheFixedDelayPlusJitter() {
        FaultRig rig = new FaultRig();
        rig.fault("f1", "delay", "north-basin", Map.of("delayMs", 5000, "jitterMs", 1000), 10, 30);
        rig.run(80, 500); // finer scans so the release time shows
        // scans at 500 ms: a message built at t is released at the first scan at or after t + delay
        List<Publication> delayed = rig.meterPublications().stream().filter(p -> p.affected()).toList();
        assertThat(delayed).isNotEmpty().allSatisfy(p -> {
            long held = Long.parseLong(p.detail().replaceAll("held (\\d+) ms", "$1"));
            assertThat(held).isBetween(5000L, 6000L);
        });
        assertThat(rig.publisher.held()).isZero();
        assertThat(rig.sentMeters()).hasSize(80);
        assertThat(delayed).hasSize(40);
    }

    @Test
    void shouldLetLaterMessagesOvertakeHeldOnes() {
        FaultRig rig = new FaultRig();
        rig.fault("f1", "reorder", "north-basin", Map.of("reorderProbability", 0.5, "holdMs", 3000), 0, 40);
        rig.run(30, PERIOD_MS);
        List<Long> seqs = rig.sentMeters().stream().map(AreaMeter::seq).toList();
        assertThat(seqs).hasSize(30).doesNotHaveDuplicates().isNotEqualTo(seqs.stream().sorted().toList());
    }

    @Test
    void shouldPublishDuplicates() {
        FaultRig rig = runWith("duplicate", "north-basin", Map.of("duplicateProbability", 1.0, "copies", 2));
        assertThat(rig.sentMeters()).hasSize(SCANS + 20);
        assertThat(rig.sentMeters().stream().filter(m -> m.seq() == 6)).hasSize(3);
    }

    @Test
    void shouldShiftTheSourceClock() {
        FaultRig rig = runWith("clockOffset", "north-basin", Map.of("offsetMs", -4000));
        List<AreaMeter> sent = rig.sentMeters();
        for (int i = 0; i < SCANS; i++) {
            long expected = rig.truthMeters.get(i).sourceTime() + (i >= 5 && i < 15 ? -4000 : 0);
            assertThat(sent.get(i).sourceTime()).isEqualTo(expected);
        }
    }

    @Test
    void shouldLetTheSourceClockDrift() {
        FaultRig rig = runWith("clockDrift", "north-basin", Map.of("driftMsPerS", 50));
        List<AreaMeter> sent = rig.sentMeters();
        // scan 9 is 8 s into the fault: 8 s × 50 ms/s = 400 ms
        assertThat(sent.get(9).sourceTime() - rig.truthMeters.get(9).sourceTime()).isEqualTo(400);
        assertThat(sent.get(15).sourceTime()).isEqualTo(rig.truthMeters.get(15).sourceTime());
    }

    @Test
    void shouldAddABiasToTheFrequencyInMillihertz() {
        FaultRig rig = runWith("bias", "north-basin", Map.of("offsetMhz", 30));
        assertThat(rig.sentMeters().get(7).frequencyHz() - rig.truthMeters.get(7).frequencyHz()).isCloseTo(0.030, within(1e-9));
        assertThat(rig.sentMeters().get(7).netInterchangeMw()).isEqualTo(rig.truthMeters.get(7).netInterchangeMw());
    }

    @Test
    void shouldLetANetInterchangeErrorDrift() {
        FaultRig rig = runWith("drift", "north-basin", Map.of("point", "netInterchange", "driftMwPerMin", 6));
        // scan 11 is 12 s into the fault: 6 MW/min × 0.2 min = 1.2 MW
        assertThat(rig.sentMeters().get(11).netInterchangeMw() - rig.truthMeters.get(11).netInterchangeMw())
                .isCloseTo(1.2, within(1e-9));
    }

    @Test
    void shouldScaleTelemetryAsIfKilowattsWereSentAsMegawatts() {
        FaultRig rig = runWith("scale", "basin-gas-1", Map.of("factor", 1000));
        List<UnitTelemetry> sent = rig.sentTelemetry();
        List<UnitTelemetry> truth = rig.publications.stream().filter(p -> p.stream().startsWith("telemetry/"))
                .map(p -> (UnitTelemetry) p.truth()).toList();
        assertThat(sent.get(6).outputMw()).isCloseTo(truth.get(6).outputMw() * 1000, within(1e-6));
        assertThat(truth.get(6).outputMw()).isBetween(150.0, 600.0);
        assertThat(sent.get(20).outputMw()).isEqualTo(truth.get(20).outputMw());
    }

    @Test
    void shouldFlipTheSignOfATieMeter() {
        FaultRig rig = runWith("signFlip", "north-basin", Map.of("point", "basin-ridge"));
        AreaMeter sent = rig.sentMeters().get(8);
        AreaMeter truth = rig.truthMeters.get(8);
        assertThat(sent.ties().get(0).flowMw()).isEqualTo(-truth.ties().get(0).flowMw());
        assertThat(truth.ties().get(0).flowMw()).isGreaterThan(50); // north-basin exports about 100 MW
        assertThat(sent.netInterchangeMw()).isEqualTo(truth.netInterchangeMw());
    }

    @Test
    void shouldAddNoiseOfTheGivenSize() {
        FaultRig rig = new FaultRig();
        rig.fault("f1", "noise", "north-basin", Map.of("sigmaMhz", 20), 0, 10_000);
        rig.run(400, PERIOD_MS);
        double[] err = IntStream.range(0, 400)
                .mapToDouble(i -> (rig.sentMeters().get(i).frequencyHz() - rig.truthMeters.get(i).frequencyHz()) * 1000).toArray();
        double mean = java.util.Arrays.stream(err).average().orElseThrow();
        double sd = Math.sqrt(java.util.Arrays.stream(err).map(e -> (e - mean) * (e - mean)).sum() / (err.length - 1));
        // sample sd of 400 normal draws: relative standard error 1/sqrt(2·399) ≈ 3.5 %; allow 15 %
        assertThat(sd).isCloseTo(20, within(3.0));
        assertThat(mean).isCloseTo(0, within(5.0));
    }

    @Test
    void shouldSpikeOnlyTheFirstMessages() {
        FaultRig rig = runWith("spike", "north-basin", Map.of("point", "netInterchange", "spikeMw", 400, "spikeMessages", 2));
        List<AreaMeter> sent = rig.sentMeters();
        for (int i = 0; i < SCANS; i++) {
            double err = sent.get(i).netInterchangeMw() - rig.truthMeters.get(i).netInterchangeMw();
            assertThat(err).isCloseTo(i == 5 || i == 6 ? 400 : 0, within(1e-9));
        }
    }

    @Test
    void shouldHoldAValueStuckWithGoodQuality() {
        FaultRig rig = runWith("stuckAt", "north-basin", Map.of("valueHz", 50.0));
        assertThat(rig.sentMeters().subList(5, 15)).allSatisfy(m -> {
            assertThat(m.frequencyHz()).isEqualTo(50.0);
            assertThat(m.frequencyQuality().validity()).isEqualTo(Validity.GOOD);
        });
        assertThat(rig.truthMeters.get(8).frequencyHz()).isNotEqualTo(50.0);
    }

    @Test
    void shouldHoldOnePointAtItsLastValueWhileTheOthersAndTheTimestampsStayLive() {
        FaultRig rig = runWith("holdLast", "north-basin", Map.of());
        List<AreaMeter> sent = rig.sentMeters();
        // the fault acts from scan 5 on: the frequency of scan 4 (the last truth before it) is kept
        double heldHz = rig.truthMeters.get(4).frequencyHz();
        assertThat(sent.subList(5, 15)).allSatisfy(m -> {
            assertThat(m.frequencyHz()).isEqualTo(heldHz);
            assertThat(m.frequencyQuality().validity()).isEqualTo(Validity.GOOD);
        });
        assertThat(sent.subList(5, 15)).extracting(AreaMeter::sourceTime).doesNotHaveDuplicates();
        assertThat(rig.truthMeters.subList(5, 15)).extracting(AreaMeter::frequencyHz).anyMatch(f -> f != heldHz);
        for (int i = 5; i < 15; i++) {
            assertThat(sent.get(i).ties().get(0).flowMw()).isEqualTo(rig.truthMeters.get(i).ties().get(0).flowMw());
        }
    }

    @Test
    void shouldMarkTheQualityInvalidWithAFlag() {
        FaultRig rig = runWith("quality", "north-basin", Map.of("point", "basin-ridge", "validity", "invalid", "flag", "failure"));
        AreaMeter m = rig.sentMeters().get(6);
        assertThat(m.ties().get(0).quality().validity()).isEqualTo(Validity.INVALID);
        assertThat(m.ties().get(0).quality().has(QualityFlag.FAILURE)).isTrue();
        assertThat(m.ties().get(0).flowMw()).isEqualTo(rig.truthMeters.get(6).ties().get(0).flowMw());
        assertThat(m.frequencyQuality().validity()).isEqualTo(Validity.GOOD);
        assertThat(rig.sentMeters().get(16).ties().get(0).quality().validity()).isEqualTo(Validity.GOOD);
    }

    @Test
    void shouldPublishNothingOnAConnectionThatIsDown() {
        FaultRig rig = runWith("disconnectAbrupt", "plant", Map.of());
        assertThat(rig.sentMeters()).hasSize(SCANS - 10);
        assertThat(rig.sentTelemetry()).hasSize(SCANS - 10);
        assertThat(rig.meterPublications()).filteredOn(p -> p.fate().equals(Publication.LINK_DOWN)).hasSize(10);
        assertThat(rig.transitions).containsExactly("start f1 at 10000", "stop f1 at 30000");
    }

    @Test
    void shouldReportAFaultedValueTheContractRefusesInsteadOfSendingIt() {
        FaultRig rig = runWith("scale", "north-basin", Map.of("factor", 1_000_000)); // deviation × 1e6 leaves [40, 70] Hz
        assertThat(rig.meterPublications()).filteredOn(p -> p.fate().equals(Publication.UNENCODABLE)).hasSize(10)
                .allSatisfy(p -> assertThat(p.detail()).contains("frequencyHz"));
    }
}
