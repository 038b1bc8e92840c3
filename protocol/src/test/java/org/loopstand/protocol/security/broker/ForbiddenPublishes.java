package org.loopstand.protocol.security.broker;

import java.util.stream.Stream;

import org.junit.jupiter.params.provider.Arguments;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The publishes the broker rules of site {@code rig1} must refuse, shared by the Mosquitto ACL test
 * and the embedded broker's test so both brokers are held to the same list.
 */
public final class ForbiddenPublishes {
    private static final TopicTree T = TopicTree.forSite("rig1");

    private ForbiddenPublishes() {
    }

    /** @return publisher, topic it must not write, an identity that would read it, one that may write it */
    public static Stream<Arguments> cases() {
        return Stream.of(
                Arguments.of("unit-G1", T.unitCommand("G2"), "unit-G2", "controller-1"),
                Arguments.of("unit-G1", T.unitCommand("G1"), "unit-G1", "controller-1"),
                Arguments.of("unit-G1", T.unitTelemetry("G2"), "controller-1", "unit-G2"),
                Arguments.of("unit-G1", T.unitAck("G2"), "controller-1", "unit-G2"),
                Arguments.of("meter-A1", T.areaMeter("A2", "M2"), "controller-1", "meter-A2"),
                Arguments.of("unit-G1", T.controllerStatus("controller-1"), "unit-G2", "controller-1"),
                Arguments.of("controller-1", T.faults(), "plant", "fault-tool"),
                Arguments.of("unit-G1", T.faults(), "plant", "fault-tool"),
                Arguments.of("meter-A1", T.unitCommand("G1"), "unit-G1", "controller-1"));
    }
}
