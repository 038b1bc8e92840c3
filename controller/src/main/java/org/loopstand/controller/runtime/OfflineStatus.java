package org.loopstand.controller.runtime;

import java.util.List;

import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The controller's last will: the retained {@code offline} status ({@code connectionLost}) the broker
 * publishes for a {@link ControllerAgent} whose connection is lost, registered when the connection is made.
 */
public final class OfflineStatus {
    private OfflineStatus() {
    }

    /** @return the retained status to register as the bus connection's last will */
    public static OutboundMessage will(String siteId, String controllerId, long epoch, long nowMs) {
        return will(siteId, controllerId, epoch, nowMs, null);
    }

    /** As {@link #will(String, String, long, long)}, signed with {@code seal} when given. */
    public static OutboundMessage will(String siteId, String controllerId, long epoch, long nowMs, StatusSeal seal) {
        ControllerStatus s = new ControllerStatus(0, Math.max(1, nowMs), controllerId, epoch, ControllerState.OFFLINE,
                List.of("connectionLost"), 0, List.of());
        if (seal != null) {
            s = seal.sign(s, Math.max(1, nowMs));
        }
        return new OutboundMessage(TopicTree.forSite(siteId).controllerStatus(controllerId),
                new MessageCodec().encode(s), Qos.AT_LEAST_ONCE, true, 0);
    }
}
