package org.loopstand.protocol.message;

import java.util.List;
import java.util.Map;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;

/** jqwik generators of valid v1 messages (every rule of the contract kept), for round trips. */
public final class MessageArbitraries {
    private static final String ID_FIRST = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";

    private MessageArbitraries() {
    }

    public static Arbitrary<String> ids() {
        Arbitrary<Character> first = Arbitraries.of(ID_FIRST.chars().mapToObj(c -> (char) c).toList());
        Arbitrary<String> rest = Arbitraries.strings().withChars(ID_FIRST + "_-").ofMinLength(0).ofMaxLength(63);
        return Combinators.combine(first, rest).as((f, r) -> f + r);
    }

    public static Arbitrary<Long> seqs() {
        return Arbitraries.longs().between(0, Long.MAX_VALUE);
    }

    public static Arbitrary<Long> sourceTimes() {
        return Arbitraries.longs().between(1, 4_102_444_800_000L); // up to 2100-01-01
    }

    public static Arbitrary<Double> mw() {
        return Arbitraries.doubles().between(-1e6, 1e6).ofScale(3);
    }

    public static Arbitrary<Double> frequencyHz() {
        return Arbitraries.doubles().between(40, 70).ofScale(4);
    }

    public static Arbitrary<Quality> qualities() {
        return Combinators.combine(Arbitraries.of(Validity.class), Arbitraries.of(QualityFlag.class).set())
                .as(Quality::new);
    }

    public static Arbitrary<TieFlow> tieFlows() {
        return Combinators.combine(ids(), mw(), qualities()).as(TieFlow::new);
    }

    public static Arbitrary<AreaMeter> areaMeters() {
        Arbitrary<List<TieFlow>> ties = tieFlows().list().ofMaxSize(4).uniqueElements(TieFlow::tie);
        return Combinators.combine(seqs(), sourceTimes(), ids(), ids(), frequencyHz(), qualities(), ties, mw())
                .flatAs((seq, time, area, meter, f, fq, t, net) -> qualities().map(
                        nq -> new AreaMeter(seq, time, area, meter, f, fq, t, net, nq)));
    }

    public static Arbitrary<UnitTelemetry> unitTelemetry() {
        Arbitrary<double[]> limits = Combinators.combine(mw(), mw())
                .as((a, b) -> new double[] {Math.min(a, b), Math.max(a, b)});
        Arbitrary<Double> rate = Arbitraries.doubles().between(0, 1e6).ofScale(2);
        return Combinators.combine(seqs(), sourceTimes(), ids(), mw(), qualities(), mw(), Arbitraries.of(UnitStatus.class),
                Arbitraries.of(ControlMode.class)).flatAs((seq, time, unit, out, q, sp, status, mode) ->
                Combinators.combine(limits, rate, rate, Arbitraries.of(true, false), seqs()).as(
                        (lim, ramp, pulse, accepts, last) -> new UnitTelemetry(seq, time, unit, out, q, sp, status,
                                mode, lim[0], lim[1], ramp, pulse, accepts, last)));
    }

    public static Arbitrary<UnitCommand> unitCommands() {
        Arbitrary<String> keyIds = ids().injectNull(0.5);
        Arbitrary<String> signatures = Arbitraries.bytes().array(byte[].class).ofMinSize(1).ofMaxSize(32)
                .map(b -> java.util.Base64.getEncoder().encodeToString(b)).injectNull(0.5);
        Arbitrary<Long> issuedAt = sourceTimes();
        Arbitrary<Long> validForMs = Arbitraries.longs().between(1, 600_000);
        Arbitrary<UnitCommand> pulses = Combinators.combine(seqs(), sourceTimes(), ids(), ids(),
                Arbitraries.longs().between(0, 1_000_000), issuedAt, validForMs,
                Arbitraries.of(PulseDirection.class)).flatAs((seq, time, unit, ctl, epoch, at, valid, dir) ->
                Combinators.combine(Arbitraries.longs().between(1, 600_000), keyIds, signatures).as(
                        (duration, key, sig) -> new UnitCommand(seq, time, unit, ctl, epoch, at, at + valid,
                                CommandKind.PULSE, dir, duration, null, key, sig)));
        Arbitrary<UnitCommand> setpoints = Combinators.combine(seqs(), sourceTimes(), ids(), ids(),
                Arbitraries.longs().between(0, 1_000_000), issuedAt, validForMs, mw())
                .flatAs((seq, time, unit, ctl, epoch, at, valid, sp) -> Combinators.combine(keyIds, signatures).as(
                        (key, sig) -> new UnitCommand(seq, time, unit, ctl, epoch, at, at + valid,
                                CommandKind.SETPOINT, null, 0, sp, key, sig)));
        return Arbitraries.oneOf(pulses, setpoints);
    }

    public static Arbitrary<String> texts(int maxChars) {
        return Arbitraries.strings().ofMinLength(1).ofMaxLength(Math.min(maxChars, 40))
                .withCharRange(' ', '~').withCharRange('\u00e0', '\u00ff').withChars('Ω', '→', '✓');
    }

    public static Arbitrary<CommandAck> commandAcks() {
        Arbitrary<CommandAck> accepted = Combinators.combine(seqs(), sourceTimes(), ids(), seqs(), ids(),
                texts(1024).injectNull(0.5)).as((seq, time, unit, cmd, ctl, detail) ->
                new CommandAck(seq, time, unit, cmd, ctl, AckOutcome.ACCEPTED, null, detail));
        Arbitrary<CommandAck> rejected = Combinators.combine(seqs(), sourceTimes(), ids(), seqs(), ids(),
                Arbitraries.of(RefusalReason.class), texts(1024).injectNull(0.5)).as(
                (seq, time, unit, cmd, ctl, reason, detail) ->
                        new CommandAck(seq, time, unit, cmd, ctl, AckOutcome.REJECTED, reason, detail));
        return Arbitraries.oneOf(accepted, rejected);
    }

    public static Arbitrary<LinkStatus> linkStatuses() {
        return Combinators.combine(seqs(), sourceTimes(), texts(256), Arbitraries.of(LinkState.class))
                .as(LinkStatus::new);
    }

    public static Arbitrary<Schedule> schedules() {
        return Combinators.combine(seqs(), sourceTimes(), ids(), mw(), frequencyHz(), sourceTimes())
                .as(Schedule::new);
    }

    public static Arbitrary<ControllerStatus> controllerStatuses() {
        Arbitrary<AreaAce> aces = Combinators.combine(ids(), mw(), mw(), ids()).as(AreaAce::new);
        return Combinators.combine(seqs(), sourceTimes(), ids(), seqs(), Arbitraries.of(ControllerState.class),
                texts(256).list().ofMaxSize(3), seqs(), aces.list().ofMaxSize(3).uniqueElements(AreaAce::area))
                .as(ControllerStatus::new);
    }

    public static Arbitrary<ClockTick> clockTicks() {
        return Combinators.combine(seqs(), sourceTimes(), Arbitraries.longs().between(0, Long.MAX_VALUE),
                Arbitraries.doubles().between(0.001, 1000).ofScale(3), Arbitraries.of(true, false))
                .as(ClockTick::new);
    }

    public static Arbitrary<RunState> runStates() {
        return Combinators.combine(seqs(), sourceTimes(), ids(), Arbitraries.of(RunPhase.class),
                Arbitraries.longs().between(0, Long.MAX_VALUE), Arbitraries.longs().between(0, Long.MAX_VALUE).injectNull(0.3),
                Arbitraries.doubles().between(0.001, 1000).ofScale(3), ids().injectNull(0.5))
                .as(RunState::new);
    }

    public static Arbitrary<Object> parameterValues() {
        return Arbitraries.oneOf(texts(40).map(s -> (Object) s),
                Arbitraries.integers().map(i -> (Object) i),
                Arbitraries.doubles().between(-1e9, 1e9).ofScale(3).map(d -> (Object) d),
                Arbitraries.of(true, false).map(b -> (Object) b));
    }

    public static Arbitrary<FaultOrder> faultOrders() {
        Arbitrary<Map<String, Object>> parameters = Arbitraries.maps(ids(), parameterValues()).ofMaxSize(4);
        Arbitrary<Double> durations = Arbitraries.doubles().between(0.001, 86_400).ofScale(3).injectNull(0.4);
        return Combinators.combine(seqs(), sourceTimes(), ids(), Arbitraries.of(FaultAction.class), ids(),
                ids().list().ofMaxSize(3), parameters, durations).as(FaultOrder::new);
    }

    public static Arbitrary<FieldReference> fieldReferences() {
        return Combinators.combine(seqs(), sourceTimes(), ids(), mw(), Arbitraries.of(true, false))
                .as(FieldReference::new);
    }

    public static Arbitrary<FieldReading> fieldReadings() {
        return Combinators.combine(seqs(), sourceTimes(), ids(), mw(), mw(), Arbitraries.of(UnitStatus.class))
                .as(FieldReading::new);
    }

    /** @return any valid message of any v1 type */
    public static Arbitrary<Object> anyMessage() {
        return Arbitraries.oneOf(List.of(areaMeters().map(m -> (Object) m), unitTelemetry().map(m -> (Object) m),
                unitCommands().map(m -> (Object) m), commandAcks().map(m -> (Object) m),
                linkStatuses().map(m -> (Object) m), schedules().map(m -> (Object) m),
                controllerStatuses().map(m -> (Object) m), clockTicks().map(m -> (Object) m), runStates().map(m -> (Object) m),
                faultOrders().map(m -> (Object) m), fieldReferences().map(m -> (Object) m),
                fieldReadings().map(m -> (Object) m)));
    }
}
