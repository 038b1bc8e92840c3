package org.loopstand.protocol.codec;

import static org.loopstand.protocol.codec.FieldChecks.MAX_DETAIL_CHARS;
import static org.loopstand.protocol.codec.FieldChecks.MAX_TEXT_CHARS;
import static org.loopstand.protocol.codec.FieldChecks.at;
import static org.loopstand.protocol.codec.FieldChecks.atLeast;
import static org.loopstand.protocol.codec.FieldChecks.base64;
import static org.loopstand.protocol.codec.FieldChecks.between;
import static org.loopstand.protocol.codec.FieldChecks.fail;
import static org.loopstand.protocol.codec.FieldChecks.freeJson;
import static org.loopstand.protocol.codec.FieldChecks.frequencyHz;
import static org.loopstand.protocol.codec.FieldChecks.header;
import static org.loopstand.protocol.codec.FieldChecks.id;
import static org.loopstand.protocol.codec.FieldChecks.list;
import static org.loopstand.protocol.codec.FieldChecks.mw;
import static org.loopstand.protocol.codec.FieldChecks.present;
import static org.loopstand.protocol.codec.FieldChecks.quality;
import static org.loopstand.protocol.codec.FieldChecks.text;
import static org.loopstand.protocol.codec.FieldChecks.unique;

import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.ExcludedUnit;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.RunState;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.SuspendedArea;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;

/**
 * Range and consistency rules of the wire contract, applied after JSON binding (and before
 * encoding). Rules are checked in record component order; the first broken one is reported with
 * the field's JSON path.
 */
public final class MessageValidator {
    /** Pulses longer than this are refused by the codec (a unit may refuse shorter ones). */
    public static final long MAX_PULSE_MS = 600_000;
    /** Fastest scenario clock rate, scenario s per wall s. */
    public static final double MAX_CLOCK_RATE = 1000;
    /** Longest fault duration, s (one year). */
    public static final double MAX_FAULT_DURATION_S = 365 * 86_400.0;

    /** Every top-level message type of the v1 contract. */
    public static final Set<Class<?>> MESSAGE_TYPES = Set.of(AreaMeter.class, UnitTelemetry.class,
            UnitCommand.class, CommandAck.class, LinkStatus.class, Schedule.class, ControllerStatus.class,
            ClockTick.class, RunState.class, FaultOrder.class, FieldReference.class, FieldReading.class);

    private MessageValidator() {
    }

    /**
     * @param message a message record of {@link #MESSAGE_TYPES}
     * @return the first broken rule, or empty if the message is valid
     */
    public static Optional<DecodeError> validate(Object message) {
        try {
            check(message);
            return Optional.empty();
        } catch (FieldChecks.Violation v) {
            return Optional.of(v.error);
        }
    }

    private static void check(Object message) {
        if (message instanceof AreaMeter m) {
            areaMeter(m);
        } else if (message instanceof UnitTelemetry m) {
            unitTelemetry(m);
        } else if (message instanceof UnitCommand m) {
            unitCommand(m);
        } else if (message instanceof CommandAck m) {
            commandAck(m);
        } else if (message instanceof LinkStatus m) {
            header(m.seq(), m.sourceTime());
            text("clientId", m.clientId(), MAX_TEXT_CHARS);
            present("state", m.state());
        } else if (message instanceof Schedule m) {
            header(m.seq(), m.sourceTime());
            id("area", m.area());
            mw("scheduledNetInterchangeMw", m.scheduledNetInterchangeMw());
            frequencyHz("scheduledFrequencyHz", m.scheduledFrequencyHz());
            atLeast("effectiveFrom", m.effectiveFrom(), 0);
        } else if (message instanceof ControllerStatus m) {
            controllerStatus(m);
        } else if (message instanceof ClockTick m) {
            header(m.seq(), m.sourceTime());
            atLeast("scenarioTimeMs", m.scenarioTimeMs(), 0);
            FieldChecks.aboveZeroAtMost("rate", m.rate(), MAX_CLOCK_RATE);
        } else if (message instanceof RunState m) {
            header(m.seq(), m.sourceTime());
            id("runId", m.runId());
            present("phase", m.phase());
            atLeast("scenarioTimeMs", m.scenarioTimeMs(), 0);
            if (m.durationMs() != null) {
                atLeast("durationMs", m.durationMs(), 0);
            }
            FieldChecks.aboveZeroAtMost("rate", m.rate(), MAX_CLOCK_RATE);
            if (m.endReason() != null) {
                id("endReason", m.endReason());
            }
        } else if (message instanceof FaultOrder m) {
            faultOrder(m);
        } else if (message instanceof FieldReference m) {
            header(m.seq(), m.sourceTime());
            id("unit", m.unit());
            mw("loadReferenceMw", m.loadReferenceMw());
        } else if (message instanceof FieldReading m) {
            header(m.seq(), m.sourceTime());
            id("unit", m.unit());
            mw("outputMw", m.outputMw());
            mw("loadReferenceMw", m.loadReferenceMw());
            present("status", m.status());
        } else {
            throw fail(DecodeErrorKind.INVALID_VALUE, DecodeError.ROOT, "not a v1 message type: "
                    + (message == null ? "null" : message.getClass().getName()));
        }
    }

    private static void areaMeter(AreaMeter m) {
        header(m.seq(), m.sourceTime());
        id("area", m.area());
        id("meter", m.meter());
        frequencyHz("frequencyHz", m.frequencyHz());
        quality("frequencyQuality", m.frequencyQuality());
        list("ties", m.ties(), MessageValidator::tieFlow);
        unique("ties", m.ties(), TieFlow::tie, "tie");
        mw("netInterchangeMw", m.netInterchangeMw());
        quality("netInterchangeQuality", m.netInterchangeQuality());
    }

    private static void tieFlow(String path, TieFlow tie) {
        id(at(path, "tie"), tie.tie());
        mw(at(path, "flowMw"), tie.flowMw());
        quality(at(path, "quality"), tie.quality());
    }

    private static void unitTelemetry(UnitTelemetry m) {
        header(m.seq(), m.sourceTime());
        id("unit", m.unit());
        mw("outputMw", m.outputMw());
        quality("outputQuality", m.outputQuality());
        mw("setpointMw", m.setpointMw());
        present("status", m.status());
        present("controlMode", m.controlMode());
        mw("regulatingMinMw", m.regulatingMinMw());
        mw("regulatingMaxMw", m.regulatingMaxMw());
        if (m.regulatingMinMw() > m.regulatingMaxMw()) {
            throw fail(DecodeErrorKind.INVALID_VALUE, "regulatingMinMw", "must be <= regulatingMaxMw ("
                    + m.regulatingMaxMw() + "), got " + m.regulatingMinMw());
        }
        between("rampMwPerMin", m.rampMwPerMin(), 0, FieldChecks.MAX_ABS_MW);
        between("pulseRateMwPerMin", m.pulseRateMwPerMin(), 0, FieldChecks.MAX_ABS_MW);
        atLeast("lastCommandSeq", m.lastCommandSeq(), 0);
    }

    private static void unitCommand(UnitCommand m) {
        header(m.seq(), m.sourceTime());
        id("unit", m.unit());
        id("controllerId", m.controllerId());
        atLeast("epoch", m.epoch(), 0);
        atLeast("issuedAt", m.issuedAt(), 1);
        if (m.validUntil() <= m.issuedAt()) {
            throw fail(DecodeErrorKind.INVALID_VALUE, "validUntil",
                    "must be > issuedAt (" + m.issuedAt() + "), got " + m.validUntil());
        }
        CommandKind kind = present("kind", m.kind());
        if (kind == CommandKind.PULSE) {
            present("direction", m.direction());
            between("durationMs", m.durationMs(), 1, MAX_PULSE_MS);
            if (m.setpointMw() != null) {
                throw fail(DecodeErrorKind.INVALID_VALUE, "setpointMw", "only a setpoint command carries setpointMw");
            }
        } else {
            if (m.direction() != null) {
                throw fail(DecodeErrorKind.INVALID_VALUE, "direction", "only a pulse command carries a direction");
            }
            between("durationMs", m.durationMs(), 0, 0);
            mw("setpointMw", m.setpointMw());
        }
        if (m.keyId() != null) {
            id("keyId", m.keyId());
        }
        if (m.signature() != null) {
            base64("signature", m.signature());
        }
    }

    private static void commandAck(CommandAck m) {
        header(m.seq(), m.sourceTime());
        id("unit", m.unit());
        atLeast("commandSeq", m.commandSeq(), 0);
        id("controllerId", m.controllerId());
        AckOutcome outcome = present("outcome", m.outcome());
        if (outcome == AckOutcome.ACCEPTED && m.reason() != null) {
            throw fail(DecodeErrorKind.INVALID_VALUE, "reason", "an accepted command has no refusal reason");
        }
        if (outcome == AckOutcome.REJECTED) {
            present("reason", m.reason());
        }
        if (m.detail() != null) {
            text("detail", m.detail(), MAX_DETAIL_CHARS);
        }
    }

    private static void controllerStatus(ControllerStatus m) {
        header(m.seq(), m.sourceTime());
        id("controllerId", m.controllerId());
        atLeast("epoch", m.epoch(), 0);
        present("state", m.state());
        list("reasons", m.reasons(), (path, reason) -> text(path, reason, MAX_TEXT_CHARS));
        atLeast("cycle", m.cycle(), 0);
        list("areas", m.areas(), MessageValidator::areaAce);
        unique("areas", m.areas(), AreaAce::area, "area");
        if (m.excludedUnits() != null) {
            list("excludedUnits", m.excludedUnits(), MessageValidator::excludedUnit);
            unique("excludedUnits", m.excludedUnits(), ExcludedUnit::unit, "unit");
        }
        if (m.suspendedAreas() != null) {
            list("suspendedAreas", m.suspendedAreas(), MessageValidator::suspendedArea);
            unique("suspendedAreas", m.suspendedAreas(), SuspendedArea::area, "area");
        }
        if (m.keyId() != null) {
            id("keyId", m.keyId());
        }
        if (m.signature() != null) {
            base64("signature", m.signature());
        }
    }

    private static void excludedUnit(String path, ExcludedUnit u) {
        id(at(path, "unit"), u.unit());
        id(at(path, "area"), u.area());
        text(at(path, "reason"), u.reason(), MAX_TEXT_CHARS);
        mw(at(path, "shortfallMw"), u.shortfallMw());
    }

    private static void suspendedArea(String path, SuspendedArea a) {
        id(at(path, "area"), a.area());
        List<String> reasons = present(at(path, "reasons"), a.reasons());
        if (reasons.isEmpty()) {
            throw fail(DecodeErrorKind.INVALID_VALUE, at(path, "reasons"), "a suspended area names at least one reason");
        }
        list(at(path, "reasons"), reasons, (p, reason) -> text(p, reason, MAX_TEXT_CHARS));
        text(at(path, "detail"), a.detail(), MAX_TEXT_CHARS);
        atLeast(at(path, "since"), a.since(), 1);
    }

    private static void areaAce(String path, AreaAce ace) {
        id(at(path, "area"), ace.area());
        mw(at(path, "aceMw"), ace.aceMw());
        mw(at(path, "filteredAceMw"), ace.filteredAceMw());
        id(at(path, "band"), ace.band());
    }

    private static void faultOrder(FaultOrder m) {
        header(m.seq(), m.sourceTime());
        id("orderId", m.orderId());
        present("action", m.action());
        id("faultType", m.faultType());
        List<String> targets = m.targets();
        list("targets", targets, FieldChecks::id);
        freeJson("parameters", present("parameters", m.parameters()));
        if (m.durationS() != null) {
            FieldChecks.aboveZeroAtMost("durationS", m.durationS(), MAX_FAULT_DURATION_S);
        }
    }
}
