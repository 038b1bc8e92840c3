package org.loopstand.plant.cli;

import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.time.Clock;

/** Link factory over real MQTT connections to one broker. */
public final class MqttLinks {
    private MqttLinks() {
    }

    /** Anonymous links (insecure loopback demo). */
    static LinkFactory to(String serverUri, Clock clock) {
        return to(serverUri, clock, LinkSecurity.insecureLoopback(), null);
    }

    /**
     * Links that log in with the identity each connection plays: with {@code --username} every
     * connection uses it (single-identity processes); otherwise the identity follows the client id —
     * {@code {site}-plant} is {@value BrokerAccessModel#PLANT_USER}, {@code {site}-unit-{u}} is
     * {@code unit-{u}} — and its password comes from the credentials file.
     *
     * @param site site id, for reading identities off client ids (null: --username only)
     */
    public static LinkFactory to(String serverUri, Clock clock, LinkSecurity security, String site) {
        return (clientId, will) -> {
            MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(serverUri).clientId(clientId);
            if (will != null) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            String identity = security.username().orElse(site == null ? null : identityOf(site, clientId));
            if (identity != null && security.hasPasswordFor(identity)) {
                security.applyTo(b, identity);
            } else if (!security.insecure()) {
                throw new IllegalArgumentException("no broker password for connection " + clientId + " (identity "
                        + identity + "); give it in --credentials-file");
            } else {
                security.applyTo(b, null);
            }
            return new MqttLink(b.build(), clock).start();
        };
    }

    /** @return the broker identity a plant-side client id plays, or null when it plays none */
    static String identityOf(String site, String clientId) {
        if (clientId.equals(site + "-plant")) {
            return BrokerAccessModel.PLANT_USER;
        }
        String unitPrefix = site + "-unit-";
        return clientId.startsWith(unitPrefix) ? BrokerAccessModel.unitUser(clientId.substring(unitPrefix.length())) : null;
    }
}
