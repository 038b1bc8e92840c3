package org.loopstand.report.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;

class CommunicationFiguresTest {
    private static final ObjectMapper JSON = new ObjectMapper();
    private final List<JournalEntry> ctl = new ArrayList<>();

    private void add(long tMs, String kind, Map<String, ?> fields) {
        ctl.add(new JournalEntry(tMs, kind, JSON.valueToTree(fields), ctl.size() + 1));
    }

    private void decided(long tMs, String state, String... reasons) {
        ObjectNode f = JSON.createObjectNode();
        f.put("state", state);
        f.putArray("reasons").addAll(List.of(reasons).stream().map(JSON.getNodeFactory()::textNode).toList());
        ctl.add(new JournalEntry(tMs, "decided", f, ctl.size() + 1));
    }

    private static Map<String, Metric> byName(List<MetricSection> sections) {
        Map<String, Metric> m = new java.util.HashMap<>();
        sections.forEach(s -> s.metrics().forEach(x -> m.put(x.name(), x)));
        return m;
    }

    @Test
    void shouldNotCountTheStartUpSuspensionAsAFallFromRegulating() {
        decided(4_000, "suspended", "noFrequency");
        decided(8_000, "suspended", "noFrequency");
        decided(12_000, "regulating");
        decided(16_000, "suspended", "staleFrequency");
        Map<String, Metric> m = byName(CommunicationFigures.sections(List.of(), ctl, null, 16));
        assertThat(m).doesNotContainKey("suspension: noFrequency");
        assertThat(m.get("suspension: staleFrequency").value()).isEqualTo("1");
        assertThat(m.get("cycles not regulating").value()).isEqualTo("3");
    }

    @Test
    void shouldCountAnAreaLeftOutWhileTheOthersRegulateAsASuspension() {
        decided(4_000, "regulating");
        decidedWithAreaOut(8_000, "north", "frequencyUnusable:north");
        decidedWithAreaOut(12_000, "north", "frequencyUnusable:north");
        decided(16_000, "regulating");
        decidedWithAreaOut(20_000, "south", "tieFlowUnusable:south:ns");
        Map<String, Metric> m = byName(CommunicationFigures.sections(List.of(), ctl, null, 20));
        // one fall of the north (not one per cycle it stayed out), one of the south
        assertThat(m.get("suspension: frequencyUnusable:north").value()).isEqualTo("1");
        assertThat(m.get("suspension: tieFlowUnusable:south:ns").value()).isEqualTo("1");
        // the controller as a whole regulated throughout
        assertThat(m.get("cycles not regulating").value()).isEqualTo("0");
    }

    private void decidedWithAreaOut(long tMs, String area, String reason) {
        ObjectNode f = JSON.createObjectNode();
        f.put("state", "regulating");
        f.putArray("reasons");
        ObjectNode a = f.putArray("suspendedAreas").addObject();
        a.put("area", area);
        a.putArray("reasons").add(reason);
        ctl.add(new JournalEntry(tMs, "decided", f, ctl.size() + 1));
    }

    @Test
    void shouldCountOnlyAcksThatAnswerASentCommandAsReceived() {
        add(1_000, "sent", Map.of("unit", "u1", "seq", 1));
        add(1_100, "received", Map.of("ack", "u1", "commandSeq", 1, "outcome", "accepted"));
        for (int i = 0; i < 3; i++) {
            add(1_200 + i, "received", Map.of("unknownAck", "u1", "controllerId", "pulse-test", "commandSeq", 900 + i));
        }
        Map<String, Metric> m = byName(CommunicationFigures.sections(List.of(), ctl, null, 10));
        assertThat(m.get("acks received by the controller").note()).startsWith("1 acks");
        assertThat(m.get("acks answering no command the controller sent").value()).isEqualTo("3");
    }

    @Test
    void shouldMarkAnInsecureRunAndCountCommandsTakenPerController() {
        List<JournalEntry> plant = new ArrayList<>();
        for (String id : List.of("controller-1", "controller-1", "intruder")) {
            plant.add(new JournalEntry(1_000, "command", JSON.valueToTree(Map.of("unit", "u1", "commandSeq", plant.size(),
                    "controllerId", id, "outcome", "accepted")), plant.size() + 1));
        }
        ObjectNode header = JSON.createObjectNode().put("security", "insecure");
        Map<String, Metric> m = byName(CommunicationFigures.sections(plant, ctl, header, 10));
        assertThat(m.get("security").value()).isEqualTo("INSECURE");
        assertThat(m.get("commands taken by the units from intruder").value()).isEqualTo("1");
        assertThat(m.get("commands taken by the units from controller-1").value()).isEqualTo("2");
    }

    @Test
    void shouldCountAMeterReadingAFaultDroppedAsNotSentByThatFault() {
        // as a plant journal holds a lossy meter: the transport journals each reading it hands to the fault stage as
        // sent (why throughFaultStage); the stage's own entry says whether it went out
        List<JournalEntry> plant = new ArrayList<>();
        String[] fates = {"dropped", "sent", "dropped"};
        for (int i = 0; i < 3; i++) {
            long t = 100_000 + 2_000L * i;
            plant.add(new JournalEntry(t, "published", JSON.valueToTree(Map.of("stream", "meter/quarry-heights/main",
                    "fate", fates[i], "faults", List.of("quarry-lossy"), "detail", fates[i])), plant.size() + 1));
            plant.add(new JournalEntry(t + 1, "published", JSON.valueToTree(Map.of("type", "AreaMeter", "seq", 57 + i,
                    "sent", true, "why", "throughFaultStage")), plant.size() + 1));
        }
        Map<String, Metric> m = byName(CommunicationFigures.sections(plant, List.of(), null, 6));
        assertThat(m.get("not sent: AreaMeter dropped by fault quarry-lossy").value()).isEqualTo("2");
        assertThat(m.get("AreaMeter published by the plant").note()).startsWith("1 messages");
        assertThat(m.keySet()).noneMatch(k -> k.contains("null"));
    }

    @Test
    void shouldShowTheStatusesTheUnitsRefusedWithTheirReason() {
        List<JournalEntry> plant = new ArrayList<>();
        for (String unit : List.of("fjord-hydro-1", "quarry-steam-1", "fjord-hydro-1")) {
            plant.add(new JournalEntry(199_538, "event", JSON.valueToTree(Map.of("event", "statusRefused", "unit", unit,
                    "reason", "wrongTopic", "detail", "status of controller controller-1 arrived on controller someone-else's topic")),
                    plant.size() + 1));
        }
        Metric m = byName(CommunicationFigures.sections(plant, List.of(), null, 600))
                .get("controller status refused by the units: wrongTopic");
        // two units, one of them journaled it twice (once per watchdog period)
        assertThat(m.value()).isEqualTo("2");
        assertThat(m.note()).contains("fjord-hydro-1: status of controller controller-1 arrived on controller someone-else's topic");
    }

    @Test
    void shouldNameTheUnitsThatLeftRemoteOnTheirWatchdogAndWhen() {
        ObjectNode header = JSON.createObjectNode();
        header.put("startedAt", 1_796_336_037_451L);
        List<JournalEntry> plant = new ArrayList<>();
        plant.add(new JournalEntry(1_796_336_067_505L, "event", JSON.valueToTree(Map.of("event", "watchdog", "unit", "fjord-hydro-1",
                "detail", "left remote: no controller status for 30.0 s (watchdog 30.0 s)")), 1));
        plant.add(new JournalEntry(1_796_336_067_650L, "event", JSON.valueToTree(Map.of("event", "watchdog", "unit", "fjord-gas-1",
                "detail", "left remote: no controller status for 30.2 s (watchdog 30.0 s)")), 2));
        Metric m = byName(CommunicationFigures.sections(plant, List.of(), header, 600)).get("units that left remote on their watchdog");
        assertThat(m.value()).isEqualTo("2");
        assertThat(m.note()).startsWith("first fjord-hydro-1 at 30 s: left remote: no controller status for 30.0 s (watchdog 30.0 s);"
                + " all: [fjord-gas-1, fjord-hydro-1]");
    }
}
