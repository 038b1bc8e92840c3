package org.loopstand.brokernode;

import static java.nio.charset.StandardCharsets.UTF_8;

import java.io.PrintStream;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.WallClock;

/**
 * A stand-in process for the cluster test, started inside a host's network namespace: as {@code pub}
 * it sends a command-like QoS 1 message every period (seq and validUntil in the payload, MQTT message
 * expiry = the validity), as {@code sub} it records what arrives. One line per event on stdout:
 * {@code conn EPOCH_MS URI}, {@code lost EPOCH_MS}, {@code sent SEQ EPOCH_MS}, {@code refused SEQ
 * EPOCH_MS REASON}, {@code recv SEQ VALID_UNTIL_MS EPOCH_MS DUP SENT_AT_MS}.
 *
 * <p>Arguments: {@code pub|sub clientId brokerList topic username password [periodMs validityMs]}.
 */
public final class ClusterProbe {
    private static final PrintStream OUT = System.out;

    private ClusterProbe() {
    }

    public static void main(String[] args) throws Exception {
        String role = args[0];
        WallClock clock = WallClock.INSTANCE;
        MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(args[2]).clientId(args[1])
                .credentials(args[4], args[5].toCharArray()).keepAliveSeconds(2).connectTimeoutMs(2000)
                .operationTimeoutMs(2000).reconnectBackoff(100, 1000, 0.2).build(), clock);
        link.addConnectionListener(new ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
                say("conn " + clock.epochMillis() + " " + link.connectedUri());
            }

            @Override
            public void onDisconnected(Throwable cause) {
                say("lost " + clock.epochMillis());
            }
        });
        if (role.equals("sub")) {
            link.subscribe(args[3], Qos.AT_LEAST_ONCE, m -> {
                String[] f = new String(m.payload(), UTF_8).split(",");
                say("recv " + f[0] + " " + f[1] + " " + clock.epochMillis() + " " + m.duplicate() + " " + f[2]);
            });
            link.start();
            Thread.currentThread().join(); // until the test kills this process
        }
        long periodMs = Long.parseLong(args[6]);
        long validityMs = Long.parseLong(args[7]);
        link.start();
        for (long seq = 1; ; seq++) {
            long sentAt = clock.epochMillis();
            long validUntil = sentAt + validityMs;
            long s = seq;
            link.publish(new OutboundMessage(args[3], (seq + "," + validUntil + "," + sentAt).getBytes(UTF_8), Qos.AT_LEAST_ONCE,
                    false, Math.max(1, validityMs / 1000))).whenComplete((ok, e) -> say(e == null
                    ? "sent " + s + " " + clock.epochMillis()
                    : "refused " + s + " " + clock.epochMillis() + " " + e.getMessage().replace(' ', '_')));
            Thread.sleep(periodMs);
        }
    }

    private static synchronized void say(String line) {
        OUT.println(line);
        OUT.flush();
    }
}
