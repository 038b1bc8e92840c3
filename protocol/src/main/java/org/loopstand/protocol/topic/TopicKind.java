package org.loopstand.protocol.topic;

import java.util.List;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.RunState;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;

/**
 * Every kind of topic in the v1 tree, with the record it carries and its default delivery.
 *
 * <p>{@link #idNames()} lists, in topic order, which ids a concrete topic of this kind holds (they
 * appear in the same order in {@link ParsedTopic#ids()}). The QoS given is the default of the wire
 * contract; measurement topics may be configured to QoS 1.
 */
public enum TopicKind {
    /** {@code …/area/{area}/meter/{meter}}. */
    AREA_METER(AreaMeter.class, Qos.AT_MOST_ONCE, false, "area/{area}/meter/{meter}"),
    /** {@code …/unit/{unit}/telemetry}. */
    UNIT_TELEMETRY(UnitTelemetry.class, Qos.AT_MOST_ONCE, false, "unit/{unit}/telemetry"),
    /** {@code …/unit/{unit}/command}; MQTT message expiry is set from validUntil. */
    UNIT_COMMAND(UnitCommand.class, Qos.AT_LEAST_ONCE, false, "unit/{unit}/command"),
    /** {@code …/unit/{unit}/ack}. */
    UNIT_ACK(CommandAck.class, Qos.AT_LEAST_ONCE, false, "unit/{unit}/ack"),
    /** {@code …/unit/{unit}/link}; retained, also the unit link's last will. */
    UNIT_LINK(LinkStatus.class, Qos.AT_LEAST_ONCE, true, "unit/{unit}/link"),
    /** {@code …/area/{area}/schedule}; retained. */
    AREA_SCHEDULE(Schedule.class, Qos.AT_LEAST_ONCE, true, "area/{area}/schedule"),
    /** {@code …/controller/{controller}/status}; retained, last will = state offline. */
    CONTROLLER_STATUS(ControllerStatus.class, Qos.AT_LEAST_ONCE, true, "controller/{controller}/status"),
    /** {@code …/clock}; retained. */
    CLOCK(ClockTick.class, Qos.AT_MOST_ONCE, true, "clock"),
    /** {@code …/run}; retained: waiting, running, ended (the end-of-run signal). */
    RUN(RunState.class, Qos.AT_LEAST_ONCE, true, "run"),
    /** {@code …/faults}. */
    FAULTS(FaultOrder.class, Qos.AT_LEAST_ONCE, false, "faults"),
    /** {@code …/field/unit/{unit}/reference}: plant interface to physics. */
    FIELD_REFERENCE(FieldReference.class, Qos.AT_LEAST_ONCE, false, "field/unit/{unit}/reference"),
    /** {@code …/field/unit/{unit}/reading}: physics to plant interface. */
    FIELD_READING(FieldReading.class, Qos.AT_MOST_ONCE, false, "field/unit/{unit}/reading");

    private final Class<?> messageType;
    private final Qos defaultQos;
    private final boolean retained;
    private final List<String> levels;
    private final List<String> idNames;

    TopicKind(Class<?> messageType, Qos defaultQos, boolean retained, String levelTemplate) {
        this.messageType = messageType;
        this.defaultQos = defaultQos;
        this.retained = retained;
        this.levels = List.of(levelTemplate.split("/"));
        this.idNames = levels.stream().filter(TopicKind::isPlaceholder).map(l -> l.substring(1, l.length() - 1)).toList();
    }

    static boolean isPlaceholder(String level) {
        return level.startsWith("{") && level.endsWith("}");
    }

    /** @return the levels below the site root, ids as placeholders like "{unit}" */
    public List<String> levelTemplate() {
        return levels;
    }

    /** @return the message record published on topics of this kind */
    public Class<?> messageType() {
        return messageType;
    }

    /** @return the QoS the wire contract gives this kind by default */
    public Qos defaultQos() {
        return defaultQos;
    }

    /** @return whether messages of this kind are published retained */
    public boolean retained() {
        return retained;
    }

    /** @return names of the ids a topic of this kind holds, in topic order (e.g. area, meter) */
    public List<String> idNames() {
        return idNames;
    }
}
