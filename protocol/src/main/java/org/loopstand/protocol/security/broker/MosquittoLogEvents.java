package org.loopstand.protocol.security.broker;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Security events read from a Mosquitto 2 log (with {@code log_timestamp true}), for the journal:
 * connects, refused logins and denied publishes. Passwords never appear in Mosquitto's log.
 */
public final class MosquittoLogEvents {
    /** A client logged in. */
    public static final String CONNECTED = "broker.connected";
    /** A login was refused (bad or missing credentials, unknown user). */
    public static final String AUTH_FAILED = "broker.authFailed";
    /** A publish was refused by the ACL (needs {@code log_type debug}). */
    public static final String PUBLISH_DENIED = "broker.publishDenied";
    /** A TLS handshake failed (untrusted certificate, plain TCP to a TLS port). */
    public static final String TLS_FAILED = "broker.tlsFailed";

    /**
     * @param brokerTimeS broker's epoch seconds from the log line, or -1 when absent
     * @param kind        one of the constants
     * @param fields      clientId, username, topic where known
     */
    public record Event(long brokerTimeS, String kind, Map<String, String> fields) {
    }

    private static final Pattern TIME = Pattern.compile("^(\\d+): (.*)$");
    private static final Pattern CONNECTED_LINE = Pattern.compile(
            "^New client connected from (\\S+) as (\\S+) \\(.*?(?:, u'([^']*)')?\\)\\.?$");
    private static final Pattern NOT_AUTHORISED = Pattern.compile("^Client (\\S+) disconnected, not authori[sz]ed\\.?$");
    private static final Pattern DENIED = Pattern.compile("^Denied PUBLISH from (\\S+) \\(.*?'([^']*)'.*$");
    private static final Pattern TLS = Pattern.compile("^(?:OpenSSL Error|Client connection from (\\S+) failed: ).*$");

    private MosquittoLogEvents() {
    }

    /** @return the security events in the log text, in order */
    public static List<Event> parse(String logText) {
        List<Event> events = new ArrayList<>();
        for (String raw : logText.split("\\R")) {
            long t = -1;
            String line = raw;
            Matcher tm = TIME.matcher(raw);
            if (tm.matches()) {
                t = Long.parseLong(tm.group(1));
                line = tm.group(2);
            }
            Matcher m;
            if ((m = CONNECTED_LINE.matcher(line)).matches()) {
                Map<String, String> f = fields("address", m.group(1), "clientId", m.group(2));
                if (m.group(3) != null) {
                    f.put("username", m.group(3));
                }
                events.add(new Event(t, CONNECTED, f));
            } else if ((m = NOT_AUTHORISED.matcher(line)).matches()) {
                events.add(new Event(t, AUTH_FAILED, fields("clientId", m.group(1))));
            } else if ((m = DENIED.matcher(line)).matches()) {
                events.add(new Event(t, PUBLISH_DENIED, fields("clientId", m.group(1), "topic", m.group(2))));
            } else if ((m = TLS.matcher(line)).matches()) {
                events.add(new Event(t, TLS_FAILED, fields("line", line)));
            }
        }
        return events;
    }

    private static Map<String, String> fields(String... kv) {
        Map<String, String> f = new LinkedHashMap<>();
        for (int i = 0; i < kv.length; i += 2) {
            f.put(kv[i], kv[i + 1]);
        }
        return f;
    }
}
