package org.loopstand.bench.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;

/** The bench's one MQTT login ({@link BenchSettings#brokerUser}), put on every connection it opens. */
final class BrokerLogin {
    private BrokerLogin() {
    }

    /** @return the builder, with the bench's login when the settings name a user */
    static MqttLinkConfig.Builder apply(MqttLinkConfig.Builder b, BenchSettings s) {
        if (s.brokerUser().isEmpty()) {
            return b;
        }
        try {
            String password = Files.readAllLines(s.outDir().resolve(BenchSettings.BROKER_PASSWORD_FILE),
                    StandardCharsets.UTF_8).get(0).strip();
            return b.credentials(s.brokerUser(), password.toCharArray());
        } catch (IOException e) {
            throw new UncheckedIOException("bench: cannot read the broker password file in " + s.outDir(), e);
        }
    }
}
