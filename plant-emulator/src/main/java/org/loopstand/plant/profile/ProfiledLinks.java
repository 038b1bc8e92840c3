package org.loopstand.plant.profile;

import java.util.function.BiConsumer;

import org.loopstand.plant.runtime.LinkFactory;

/** Wraps every connection a factory makes in a {@link ProfiledBus}; last wills are written in the profile too. */
public final class ProfiledLinks {
    private ProfiledLinks() {
    }

    /**
     * @param onUnreadable told (wire topic, reason) when a delivery's mapped field cannot be read back
     */
    public static LinkFactory of(LinkFactory inner, WireProfile profile, BiConsumer<String, String> onUnreadable) {
        return (clientId, will) -> new ProfiledBus(inner.connect(clientId, will == null ? null : profile.toWire(will)), profile,
                onUnreadable);
    }
}
