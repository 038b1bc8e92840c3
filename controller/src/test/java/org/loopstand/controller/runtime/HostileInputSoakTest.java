package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.TreeMap;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.topic.TopicTree;

/**
 * A hostile-input soak in lockstep (in-memory broker, virtual clock): the two-area plant and the
 * controller run 400 s of scenario time with a 100 MW load step while a third client publishes
 * 100,000 valid-looking but wrong messages on every topic either side subscribes to (commands,
 * controller statuses, meters, telemetry, acks, schedules, clock, faults): expired, issued ahead,
 * year-long, epochs beyond their bound or from an intruder, statuses on another controller's topic,
 * seq jumps of 10^9, copies on the wrong topic, malformed and oversized payloads. The run is in the
 * insecure demo mode on purpose: there every rule but the signature must hold on its own. Each of
 * these messages breaks at least one rule; none may move a unit, fence it or blind a source.
 */
class HostileInputSoakTest {
    static final int HOSTILE_MESSAGES = 100_000;
    private static final String CTRL = "controller-1";
    private static final long FAR = 1_000_000_000L;
    private static final Set<RefusalReason> FENCING = EnumSet.of(RefusalReason.WRONG_EPOCH, RefusalReason.OUT_OF_ORDER,
            RefusalReason.DUPLICATE, RefusalReason.WRONG_CONTROLLER, RefusalReason.NOT_YET_VALID, RefusalReason.BAD_LIFETIME);

    private final MessageCodec codec = new MessageCodec();
    private final Random random = new Random(15);
    private final Map<String, Long> sentByKind = new TreeMap<>();
    private AreaMeter lastMeter;
    private UnitTelemetry lastTelemetry;
    private boolean intruding;

    @Test
    void shouldNeitherPulseNorFenceNorBlindUnderAHundredThousandWrongMessages() {
        ch.qos.logback.classic.Logger rig = (ch.qos.logback.classic.Logger) org.slf4j.LoggerFactory.getLogger("org.loopstand");
        ch.qos.logback.classic.Level level = rig.getLevel();
        rig.setLevel(ch.qos.logback.classic.Level.ERROR); // 10^5 refusals logged one by one would be the run's cost
        try {
            soak();
        } finally {
            rig.setLevel(level);
        }
    }

    private void soak() {
        Runtime rt = Runtime.getRuntime();
        System.gc();
        long heapBeforeBytes = rt.totalMemory() - rt.freeMemory();
        Set<String> controllerCommands = new java.util.concurrent.ConcurrentSkipListSet<>();
        StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(), null, bus -> new ForwardingBus(bus) {
                    @Override
                    public java.util.concurrent.CompletableFuture<Void> publish(OutboundMessage m) {
                        codec.decode(m.payload(), UnitCommand.class).message()
                                .ifPresent(c -> controllerCommands.add(c.unit() + "/" + c.seq()));
                        return super.publish(m);
                    }
                });
        List<String> takenByUnits = new ArrayList<>();
        List<String> ownRefusedFencing = new ArrayList<>();
        for (UnitDutyCycle h : loop.plant.unitCycles()) {
            h.unit().setCommandListener((nowMs, c, outcome, reason, acted) -> {
                String key = c.unit() + "/" + c.seq();
                if (outcome == AckOutcome.ACCEPTED) {
                    takenByUnits.add(c.controllerId() + ":" + key);
                } else if (c.controllerId().equals(CTRL) && controllerCommands.contains(key) && FENCING.contains(reason)) {
                    ownRefusedFencing.add(key + " " + reason);
                }
            });
        }
        TopicTree topics = TopicTree.forSite("two-area-textbook");
        loop.broker.connect("witness").subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, m -> {
            if (intruding) {
                return; // the witness keeps the plant's own latest readings only
            }
            if (m.topic().contains("/meter/")) {
                codec.decode(m.payload(), AreaMeter.class).message().ifPresent(a -> lastMeter = a);
            } else if (m.topic().endsWith("/telemetry")) {
                codec.decode(m.payload(), UnitTelemetry.class).message().ifPresent(t -> lastTelemetry = t);
            }
        });
        InMemoryBus intruder = loop.broker.connect("intruder");
        long startNanos = System.nanoTime();
        int sent = 0;
        int slices = 0;
        while (loop.clock.elapsedSeconds() < 400) {
            if (slices == 40 * 50) {
                loop.sim.stepLoadMw("area1", 100);
            }
            loop.runTo(loop.clock.elapsedSeconds() + StudyLoop.SLICE_MS / 1000.0);
            slices++;
            intruding = true; // the in-memory broker delivers during publish (DIRECT)
            for (int i = 0; i < 5 && sent < HOSTILE_MESSAGES && lastMeter != null && lastTelemetry != null; i++, sent++) {
                hostile(intruder, topics, loop);
            }
            intruding = false;
            // the study loop's recorder keeps every command and ack it saw: not the rig's memory, drop it
            loop.published.clear();
            loop.acks.clear();
        }
        double wallS = (System.nanoTime() - startNanos) / 1e9;
        loop.runTo(410);

        // zero pulses from bad data: every command a unit took is one the controller sent
        assertThat(takenByUnits).isNotEmpty();
        assertThat(takenByUnits).allSatisfy(k -> {
            assertThat(k).startsWith(CTRL + ":");
            assertThat(controllerCommands).contains(k.substring(CTRL.length() + 1));
        });
        // no unit fenced: none of the controller's own commands was refused for epoch, seq or controller
        assertThat(ownRefusedFencing).isEmpty();
        for (UnitDutyCycle h : loop.plant.unitCycles()) {
            assertThat(h.unit().controlMode()).as(h.unit().unitId()).isEqualTo(ControlMode.REMOTE);
            assertThat(h.unit().activeController()).isEqualTo(CTRL);
        }
        // no source blinded: meters and telemetry still usable, control regulating
        long now = loop.clock.epochMillis();
        for (String area : List.of("area1", "area2")) {
            assertThat(loop.agent.intake().areaInputs(area, now).frequencyHz().usable()).as(area).isTrue();
        }
        for (UnitDutyCycle h : loop.plant.unitCycles()) {
            assertThat(loop.agent.intake().telemetryCheck(h.unit().unitId()).evaluate(now).usable()).isTrue();
        }
        assertThat(loop.agent.lastOutcome().reasons()).isEmpty();
        assertThat(loop.agent.acksUnknown()).isGreaterThan(0);
        // memory bounded: what the run kept is bounded by design, the heap did not grow with the flood
        System.gc();
        long heapGrowthBytes = rt.totalMemory() - rt.freeMemory() - heapBeforeBytes;
        assertThat(heapGrowthBytes).isLessThan(256L * 1024 * 1024);
        assertThat(sent).isEqualTo(HOSTILE_MESSAGES);
        System.out.printf("hostile soak: %d wrong messages %s over %.0f s of scenario time, %d controller commands"
                        + " (%d taken), %.1f s wall, heap growth %d MiB, intake rejections %s%n", sent, sentByKind,
                loop.clock.elapsedSeconds(), controllerCommands.size(), takenByUnits.size(), wallS, heapGrowthBytes >> 20,
                loop.agent.intake().rejectedByReason());
    }

    private void count(String kind) {
        sentByKind.merge(kind, 1L, Long::sum);
    }

    private void publish(InMemoryBus bus, String topic, byte[] payload) {
        bus.publish(OutboundMessage.of(topic, payload, Qos.AT_LEAST_ONCE));
    }

    private void hostile(InMemoryBus bus, TopicTree t, StudyLoop loop) {
        long now = loop.clock.epochMillis();
        long epoch = StudyLoop.START_MS;
        String unit = random.nextBoolean() ? "gen1" : "gen2";
        String other = unit.equals("gen1") ? "gen2" : "gen1";
        long seq = FAR + random.nextInt(1_000_000);
        switch (random.nextInt(20)) {
            case 0 -> { // expired, with a higher epoch (the one that used to fence)
                count("command expired, higher epoch");
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, now - 8_000, unit, CTRL,
                        epoch + 3_600_000, now - 4_000, PulseDirection.RAISE, 2_000)));
            }
            case 1 -> { // a year-long validity
                count("command lifetime 365 d");
                publish(bus, t.unitCommand(unit), codec.encode(new UnitCommand(seq, now, unit, CTRL, epoch + 1, now,
                        now + 365L * 86_400_000L, CommandKind.PULSE, PulseDirection.RAISE, 2_000, null, null, null)));
            }
            case 2 -> { // issued ten minutes ahead of the unit's clock
                count("command issued ahead");
                long ahead = now + 600_000;
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, ahead, unit, CTRL, epoch, ahead + 4_000,
                        PulseDirection.LOWER, 2_000)));
            }
            case 3 -> { // epoch beyond its bound, otherwise fresh
                count("command epoch beyond bound");
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, now, unit, CTRL, FAR * FAR,
                        now + 4_000, PulseDirection.RAISE, 2_000)));
            }
            case 4 -> { // an intruder's id, fresh
                count("command from intruder");
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, now, unit, "intruder", epoch,
                        now + 4_000, PulseDirection.RAISE, 2_000)));
            }
            case 5 -> { // another unit's command on this unit's topic
                count("command wrong topic");
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, now, other, CTRL, epoch,
                        now + 4_000, PulseDirection.RAISE, 2_000)));
            }
            case 6 -> { // expired with a seq jump in the current epoch
                count("command expired, seq + 10^9");
                publish(bus, t.unitCommand(unit), codec.encode(UnitCommand.pulse(seq, now - 8_000, unit, CTRL, epoch,
                        now - 4_000, PulseDirection.RAISE, 2_000)));
            }
            case 7 -> { // malformed and oversized payloads on a command topic
                count("command malformed or oversized");
                publish(bus, t.unitCommand(unit), random.nextBoolean()
                        ? "{\"seq\":1,\"controllerId\":\"bad id!\",\"unit\":".getBytes(StandardCharsets.UTF_8)
                        : oversized());
            }
            case 8 -> { // controller-1's status with a huge epoch on an intruder's topic
                count("status wrong topic");
                publish(bus, t.controllerStatus("intruder"), codec.encode(new ControllerStatus(seq, now, CTRL,
                        epoch + 3_600_000, ControllerState.OFFLINE, List.of(), 0, List.of())));
            }
            case 9 -> { // an epoch beyond its bound on the controller's own topic
                count("status epoch beyond bound");
                publish(bus, t.controllerStatus(CTRL), codec.encode(new ControllerStatus(seq, now, CTRL, FAR * FAR,
                        ControllerState.OFFLINE, List.of(), 0, List.of())));
            }
            case 10 -> { // a controller no unit accepts says offline
                count("status not accepted");
                publish(bus, t.controllerStatus("controller-9"), codec.encode(new ControllerStatus(seq, now,
                        "controller-9", epoch, ControllerState.OFFLINE, List.of(), 0, List.of())));
            }
            case 11 -> { // garbage on a status topic
                count("status malformed or oversized");
                publish(bus, t.controllerStatus(CTRL), random.nextBoolean() ? new byte[] {(byte) 0xC3, 0x28, '{'} : oversized());
            }
            case 12 -> { // the latest real meter reading again with seq + 10^9
                count("meter seq + 10^9");
                AreaMeter m = lastMeter;
                publish(bus, t.areaMeter(m.area(), m.meter()), codec.encode(new AreaMeter(m.seq() + FAR, m.sourceTime(),
                        m.area(), m.meter(), m.frequencyHz(), m.frequencyQuality(), m.ties(), m.netInterchangeMw(),
                        m.netInterchangeQuality())));
            }
            case 13 -> { // a meter reading on the other area's topic
                count("meter wrong topic");
                AreaMeter m = lastMeter;
                String otherArea = m.area().equals("area1") ? "area2" : "area1";
                publish(bus, t.areaMeter(otherArea, m.meter()), codec.encode(m));
            }
            case 14 -> { // the latest telemetry again with seq + 10^9
                count("telemetry seq + 10^9");
                UnitTelemetry x = lastTelemetry;
                publish(bus, t.unitTelemetry(x.unit()), codec.encode(new UnitTelemetry(x.seq() + FAR, x.sourceTime(),
                        x.unit(), x.outputMw(), x.outputQuality(), x.setpointMw(), x.status(), x.controlMode(),
                        x.regulatingMinMw(), x.regulatingMaxMw(), x.rampMwPerMin(), x.pulseRateMwPerMin(),
                        x.acceptsSetpoints(), x.lastCommandSeq())));
            }
            case 15 -> { // telemetry of one unit on the other's topic, and oversized telemetry
                count("telemetry wrong topic or oversized");
                publish(bus, t.unitTelemetry(other.equals(lastTelemetry.unit()) ? unit : other),
                        random.nextBoolean() ? codec.encode(lastTelemetry) : oversized());
            }
            case 16 -> { // acks for commands never sent
                count("ack for no command sent");
                publish(bus, t.unitAck(unit), codec.encode(new CommandAck(seq, now, unit, seq, CTRL, AckOutcome.ACCEPTED,
                        null, null)));
            }
            case 17 -> { // a schedule for another area on this area's topic
                count("schedule wrong topic");
                publish(bus, t.areaSchedule("area1"), codec.encode(new Schedule(seq, now, "area2", 900, 50, now)));
            }
            case 18 -> { // garbage on the clock and fault topics
                count("clock or faults malformed");
                publish(bus, random.nextBoolean() ? t.clock() : t.faults(), "{\"seq\":-1}".getBytes(StandardCharsets.UTF_8));
            }
            default -> { // oversized anywhere the controller listens
                count("meter or ack oversized");
                publish(bus, random.nextBoolean() ? t.areaMeter("area1", "main") : t.unitAck(unit), oversized());
            }
        }
    }

    private static byte[] oversized() {
        byte[] b = new byte[MessageCodec.DEFAULT_MAX_PAYLOAD_BYTES + 1024];
        java.util.Arrays.fill(b, (byte) ' ');
        b[0] = '{';
        b[b.length - 1] = '}';
        return b;
    }
}
