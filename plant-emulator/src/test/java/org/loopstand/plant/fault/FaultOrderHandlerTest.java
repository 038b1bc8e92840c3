package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;

/** Live fault orders: start, stop and refusals, all journaled beside the truth they affect. */
class FaultOrderHandlerTest {
    @TempDir
    Path dir;

    private static FaultOrder order(String id, FaultAction action, String type, List<String> targets, Map<String, Object> params,
            Double durationS) {
        return new FaultOrder(1, FaultRig.START_MS, id, action, type, targets, params, durationS);
    }

    private static InboundMessage wire(FaultOrder o) {
        return new InboundMessage("loopstand/v1/demo-site/faults", new MessageCodec().encode(o), Qos.AT_LEAST_ONCE, false, false, 0);
    }

    @Test
    void shouldStartAndStopALiveFaultAndJournalTruthBesidePublished() throws Exception {
        Path file = dir.resolve("plant.jsonl");
        FaultRig rig = new FaultRig();
        FaultOrderHandler handler;
        try (JournalWriter journal = JournalWriter.create(file, "plant", FaultRig.START_MS, rig.clock)) {
            FaultObserver observer = FaultObserver.all(List.of(new FaultJournal(journal)));
            FaultEngine engine = new FaultEngine(rig.clock, FaultRig.START_MS, observer);
            handler = new FaultOrderHandler(engine, FaultLibrary.standard(), rig.catalog, new MessageCodec(), observer, rig.clock);
            FaultyPublisher publisher = new FaultyPublisher(TargetCatalog.PLANT_CONNECTION, rig.bus,
                    org.loopstand.protocol.topic.TopicTree.forSite("demo-site"), rig.codec, engine, rig.catalog, observer, rig.clock,
                    Qos.AT_MOST_ONCE, 1, 10);
            for (int i = 0; i < 20; i++) {
                if (i == 3) {
                    handler.onMessage(wire(order("op-1", FaultAction.START, "bias", List.of("north-basin"), Map.of("offsetMhz", 100), null)));
                }
                if (i == 8) {
                    handler.onMessage(wire(order("op-1", FaultAction.STOP, "bias", List.of(), Map.of(), null)));
                }
                handler.doWork();
                engine.update();
                publisher.publishMeter(rig.truthMeter());
                rig.clock.advanceMillis(2000);
            }
        }
        List<AreaMeter> sent = rig.sentMeters();
        assertThat(sent).hasSize(20);
        for (int i = 0; i < 20; i++) {
            double expectedOffset = i >= 3 && i < 8 ? 0.1 : 0.0;
            assertThat(sent.get(i).frequencyHz() - 50.0).isCloseTo(expectedOffset, org.assertj.core.api.Assertions.within(1e-9));
        }
        List<JournalEntry> entries = JournalReader.readAll(file).entries();
        assertThat(entries).filteredOn(e -> e.kind().equals("fault")).extracting(e -> e.text("action"))
                .containsExactly("start", "stop");
        assertThat(entries).filteredOn(e -> e.kind().equals("fault")).first().satisfies(e -> {
            assertThat(e.text("source")).isEqualTo("order");
            assertThat(e.get("parameters").get("offsetMhz").asDouble()).isEqualTo(100.0);
        });
        List<JournalEntry> truth = entries.stream().filter(e -> e.kind().equals("truth")).toList();
        List<JournalEntry> published = entries.stream().filter(e -> e.kind().equals("published")).toList();
        assertThat(truth).hasSize(5);
        assertThat(published).hasSize(5);
        for (int i = 0; i < 5; i++) {
            double t = truth.get(i).get("record").get("frequencyHz").asDouble();
            double p = published.get(i).get("record").get("frequencyHz").asDouble();
            assertThat(p - t).isCloseTo(0.1, org.assertj.core.api.Assertions.within(1e-9));
            assertThat(t).isEqualTo(50.0); // no load change in this rig before the first physics step
        }
    }

    @Test
    void shouldRefuseUnknownTypesTargetsAndUndecodableOrdersWithAReason() {
        FaultRig rig = new FaultRig();
        List<String> refusals = new java.util.ArrayList<>();
        FaultObserver observer = new FaultObserver() {
            @Override
            public void faultRefused(long tMs, String orderId, String reason) {
                refusals.add(orderId + ": " + reason);
            }
        };
        FaultEngine engine = new FaultEngine(rig.clock, FaultRig.START_MS, observer);
        FaultOrderHandler handler = new FaultOrderHandler(engine, FaultLibrary.standard(), rig.catalog, new MessageCodec(), observer,
                rig.clock);
        handler.onMessage(wire(order("o1", FaultAction.START, "meltdown", List.of("north-basin"), Map.of(), null)));
        handler.onMessage(wire(order("o2", FaultAction.START, "delay", List.of("east-shore"), Map.of("delayMs", 100), 30.0)));
        handler.onMessage(wire(order("o3", FaultAction.START, "delay", List.of("north-basin"), Map.of("delayMs", true), 30.0)));
        handler.onMessage(new InboundMessage("loopstand/v1/demo-site/faults", "{\"seq\":1}".getBytes(StandardCharsets.UTF_8),
                Qos.AT_LEAST_ONCE, false, false, 0));
        handler.onMessage(wire(order("o4", FaultAction.STOP, "delay", List.of(), Map.of(), null)));
        handler.onMessage(wire(order("o5", FaultAction.START, "freezeValue", List.of("north-basin"), Map.of(), 60.0)));
        handler.onMessage(wire(order("o6", FaultAction.START, "repeatLast", List.of("north-basin"), Map.of(), 60.0)));
        assertThat(handler.doWork()).isEqualTo(7);
        assertThat(refusals).hasSize(6);
        assertThat(refusals.get(0)).contains("unknown fault type 'meltdown'");
        assertThat(refusals.get(1)).contains("unknown target 'east-shore'");
        assertThat(refusals.get(2)).contains("delayMs must be a finite number (ms), got true");
        assertThat(refusals.get(3)).startsWith("?: fault order on loopstand/v1/demo-site/faults does not decode");
        assertThat(refusals.get(4)).contains("no fault 'o4'");
        assertThat(refusals.get(5)).startsWith("o6: contradicts fault 'o5' (freezeValue)");
        assertThat(engine.active()).extracting(FaultSpec::id).containsExactly("o5");
    }

    @Test
    void shouldEndALiveFaultAfterItsDuration() {
        FaultRig rig = new FaultRig();
        FaultEngine engine = rig.engine;
        FaultOrderHandler handler = new FaultOrderHandler(engine, FaultLibrary.standard(), rig.catalog, new MessageCodec(),
                FaultObserver.NONE, rig.clock);
        rig.clock.advanceMillis(100_000);
        assertThat(handler.handle(order("o1", FaultAction.START, "blackout", List.of("basin-gas-1"), Map.of(), 30.0))).isEmpty();
        rig.clock.advanceMillis(29_000);
        engine.update();
        assertThat(engine.active()).hasSize(1);
        rig.clock.advanceMillis(1_000);
        engine.update();
        assertThat(engine.active()).isEmpty();
        assertThat(rig.transitions).containsExactly("start o1 at 100000", "stop o1 at 130000");
    }
}
