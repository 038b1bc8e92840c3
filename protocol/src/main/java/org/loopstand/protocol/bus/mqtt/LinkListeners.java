package org.loopstand.protocol.bus.mqtt;

import java.util.List;
import java.util.Objects;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.function.Consumer;
import org.loopstand.protocol.bus.ConnectionListener;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/** The {@link ConnectionListener}s of one link; one that throws is logged and the others still hear. */
final class LinkListeners {
    private static final Logger LOG = LoggerFactory.getLogger(LinkListeners.class);

    private final String clientId;
    private final List<ConnectionListener> listeners = new CopyOnWriteArrayList<>();

    LinkListeners(String clientId) {
        this.clientId = clientId;
    }

    void add(ConnectionListener listener) {
        listeners.add(Objects.requireNonNull(listener, "listener"));
    }

    /** @param reconnect false for the first connect of the link */
    void connected(boolean reconnect) {
        tellAll(l -> l.onConnected(reconnect));
    }

    /** @param cause null for a disconnect of our own */
    void disconnected(Throwable cause) {
        tellAll(l -> l.onDisconnected(cause));
    }

    private void tellAll(Consumer<ConnectionListener> call) {
        for (ConnectionListener l : listeners) {
            try {
                call.accept(l);
            } catch (RuntimeException e) {
                LOG.warn("{}: connection listener failed: {}", clientId, e.toString());
            }
        }
    }
}
