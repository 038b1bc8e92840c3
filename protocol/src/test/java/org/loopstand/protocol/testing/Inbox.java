package org.loopstand.protocol.testing;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageListener;

/** A listener that keeps every message it gets, for assertions. */
public final class Inbox implements MessageListener {
    private final List<InboundMessage> messages = new CopyOnWriteArrayList<>();

    @Override
    public void onMessage(InboundMessage message) {
        messages.add(message);
    }

    public List<InboundMessage> messages() {
        return List.copyOf(messages);
    }

    /** @return payloads decoded as UTF-8, in arrival order */
    public List<String> payloads() {
        return messages.stream().map(m -> new String(m.payload(), StandardCharsets.UTF_8)).toList();
    }

    public int size() {
        return messages.size();
    }
}
