package org.loopstand.plant.broker;

import com.hivemq.embedded.EmbeddedExtension;
import com.hivemq.extension.sdk.api.ExtensionMain;
import com.hivemq.extension.sdk.api.auth.PublishAuthorizer;
import com.hivemq.extension.sdk.api.auth.SimpleAuthenticator;
import com.hivemq.extension.sdk.api.auth.SubscriptionAuthorizer;
import com.hivemq.extension.sdk.api.auth.parameter.PublishAuthorizerInput;
import com.hivemq.extension.sdk.api.auth.parameter.PublishAuthorizerOutput;
import com.hivemq.extension.sdk.api.auth.parameter.SimpleAuthInput;
import com.hivemq.extension.sdk.api.auth.parameter.SimpleAuthOutput;
import com.hivemq.extension.sdk.api.auth.parameter.SubscriptionAuthorizerInput;
import com.hivemq.extension.sdk.api.auth.parameter.SubscriptionAuthorizerOutput;
import com.hivemq.extension.sdk.api.packets.connect.ConnackReasonCode;
import com.hivemq.extension.sdk.api.packets.publish.AckReasonCode;
import com.hivemq.extension.sdk.api.packets.subscribe.SubackReasonCode;
import com.hivemq.extension.sdk.api.parameter.ClientBasedInput;
import com.hivemq.extension.sdk.api.parameter.ExtensionStartInput;
import com.hivemq.extension.sdk.api.parameter.ExtensionStartOutput;
import com.hivemq.extension.sdk.api.parameter.ExtensionStopInput;
import com.hivemq.extension.sdk.api.parameter.ExtensionStopOutput;
import com.hivemq.extension.sdk.api.services.Services;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.util.HashMap;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.atomic.AtomicLong;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.security.broker.BrokerIdentity;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Broker-side security of the embedded broker, as an embedded HiveMQ extension: username/password
 * from the site's users file (no anonymous clients, unknown users refused), and per-identity topic
 * rules from the same {@link BrokerAccessModel} that generates the Mosquitto ACL. A publish the
 * identity may not make is answered with PUBACK "not authorized" and dropped; a subscription to a
 * filter not wholly allowed is answered with SUBACK "not authorized"; and a message on a topic the
 * identity may not read is never delivered to it (outbound check, defence in depth). Passwords are
 * compared in constant time and never logged.
 */
public final class BrokerAuthExtension implements ExtensionMain {
    private static final Logger LOG = LoggerFactory.getLogger(BrokerAuthExtension.class);
    /** Connection attribute holding the authenticated username. */
    static final String USER_ATTRIBUTE = "loopstand.username";

    private final BrokerAccessModel model;
    private final Map<String, byte[]> passwordsUtf8 = new HashMap<>();
    private final AtomicLong authFailures = new AtomicLong();
    private final AtomicLong publishDenials = new AtomicLong();
    private final AtomicLong subscribeDenials = new AtomicLong();
    private final AtomicLong deliveryDenials = new AtomicLong();

    /**
     * @param model     who may publish and read what
     * @param passwords username → password; every user must be an identity of the model
     */
    public BrokerAuthExtension(BrokerAccessModel model, Map<String, char[]> passwords) {
        this.model = model;
        for (Map.Entry<String, char[]> e : passwords.entrySet()) {
            if (model.identity(e.getKey()).isEmpty()) {
                throw new IllegalArgumentException("broker user " + e.getKey() + " is not an identity of site " + model.site());
            }
            ByteBuffer b = StandardCharsets.UTF_8.encode(CharBuffer.wrap(e.getValue()));
            byte[] bytes = new byte[b.remaining()];
            b.get(bytes);
            passwordsUtf8.put(e.getKey(), bytes);
        }
        if (passwordsUtf8.isEmpty()) {
            throw new IllegalArgumentException("no broker users given: nobody could connect");
        }
    }

    /** @return this extension wrapped for {@code EmbeddedHiveMQ.builder().withEmbeddedExtension} */
    public EmbeddedExtension embedded() {
        return EmbeddedExtension.builder().withId("loopstand-auth").withName("Loopstand broker auth")
                .withVersion("1").withPriority(1000).withStartPriority(1000).withAuthor("Loopstand")
                .withExtensionMain(this).build();
    }

    @Override
    public void extensionStart(ExtensionStartInput input, ExtensionStartOutput output) {
        SimpleAuthenticator authenticator = this::authenticate;
        PublishAuthorizer publish = this::authorizePublish;
        SubscriptionAuthorizer subscribe = this::authorizeSubscription;
        Services.securityRegistry().setAuthenticatorProvider(in -> authenticator);
        Services.securityRegistry().setAuthorizerProvider(in -> new CombinedAuthorizer(publish, subscribe));
        Services.initializerRegistry().setClientInitializer((in, context) -> context.addPublishOutboundInterceptor(
                (pin, pout) -> {
                    Optional<BrokerIdentity> id = identityOf(pin);
                    if (id.isEmpty() || !id.get().mayReceive(pin.getPublishPacket().getTopic())) {
                        deliveryDenials.incrementAndGet();
                        pout.preventPublishDelivery();
                    }
                }));
        LOG.info("broker auth on: {} users, topic rules of site {}", passwordsUtf8.size(), model.site());
    }

    @Override
    public void extensionStop(ExtensionStopInput input, ExtensionStopOutput output) {
    }

    private void authenticate(SimpleAuthInput in, SimpleAuthOutput out) {
        Optional<String> user = in.getConnectPacket().getUserName();
        Optional<ByteBuffer> pw = in.getConnectPacket().getPassword();
        byte[] expected = user.map(passwordsUtf8::get).orElse(null);
        byte[] given = pw.map(b -> {
            byte[] a = new byte[b.remaining()];
            b.duplicate().get(a);
            return a;
        }).orElse(new byte[0]);
        // Compare even for an unknown user so the answer time does not tell which users exist.
        boolean ok = MessageDigest.isEqual(expected == null ? new byte[given.length + 1] : expected, given) && expected != null;
        if (!ok) {
            authFailures.incrementAndGet();
            LOG.warn("broker.authFailed client {} user {}", in.getClientInformation().getClientId(), user.orElse("(none)"));
            out.failAuthentication(ConnackReasonCode.BAD_USER_NAME_OR_PASSWORD, "bad username or password");
            return;
        }
        in.getConnectionInformation().getConnectionAttributeStore().putAsString(USER_ATTRIBUTE, user.get());
        out.authenticateSuccessfully();
    }

    private void authorizePublish(PublishAuthorizerInput in, PublishAuthorizerOutput out) {
        String topic = in.getPublishPacket().getTopic();
        Optional<BrokerIdentity> id = identityOf(in);
        if (id.isPresent() && id.get().mayPublish(topic)) {
            out.authorizeSuccessfully();
        } else {
            publishDenials.incrementAndGet();
            LOG.warn("broker.publishDenied user {} topic {}", id.map(BrokerIdentity::username).orElse("(none)"), topic);
            out.failAuthorization(AckReasonCode.NOT_AUTHORIZED, "not authorized to publish on " + topic);
        }
    }

    private void authorizeSubscription(SubscriptionAuthorizerInput in, SubscriptionAuthorizerOutput out) {
        String filter = in.getSubscription().getTopicFilter();
        Optional<BrokerIdentity> id = identityOf(in);
        if (id.isPresent() && id.get().maySubscribe(filter)) {
            out.authorizeSuccessfully();
        } else {
            subscribeDenials.incrementAndGet();
            LOG.warn("broker.subscribeDenied user {} filter {}", id.map(BrokerIdentity::username).orElse("(none)"), filter);
            out.failAuthorization(SubackReasonCode.NOT_AUTHORIZED, "not authorized to subscribe to " + filter);
        }
    }

    private Optional<BrokerIdentity> identityOf(ClientBasedInput in) {
        return in.getConnectionInformation().getConnectionAttributeStore().getAsString(USER_ATTRIBUTE)
                .flatMap(model::identity);
    }

    /** @return connections refused for a bad or missing username/password */
    public long authFailures() {
        return authFailures.get();
    }

    /** @return publishes refused */
    public long publishDenials() {
        return publishDenials.get();
    }

    /** @return subscriptions refused */
    public long subscribeDenials() {
        return subscribeDenials.get();
    }

    /** @return messages withheld from a subscriber not allowed to read them */
    public long deliveryDenials() {
        return deliveryDenials.get();
    }

    /** HiveMQ takes one authorizer per client; this one answers both publishes and subscriptions. */
    private record CombinedAuthorizer(PublishAuthorizer publish, SubscriptionAuthorizer subscribe)
            implements PublishAuthorizer, SubscriptionAuthorizer {
        @Override
        public void authorizePublish(PublishAuthorizerInput in, PublishAuthorizerOutput out) {
            publish.authorizePublish(in, out);
        }

        @Override
        public void authorizeSubscribe(SubscriptionAuthorizerInput in, SubscriptionAuthorizerOutput out) {
            subscribe.authorizeSubscribe(in, out);
        }
    }
}
