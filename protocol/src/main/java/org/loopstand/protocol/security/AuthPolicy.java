package org.loopstand.protocol.security;

import java.net.InetAddress;
import java.net.UnknownHostException;
import java.util.ArrayList;
import java.util.List;
import org.loopstand.protocol.bus.mqtt.BrokerEndpoints;

/**
 * Decides whether a process may start with the security settings it was given.
 *
 * <p>Rules: a secured start needs broker credentials, a TLS broker URL ({@code ssl://}) unless the
 * broker is on loopback, and command keys. Without them a process starts only with
 * {@code --insecure}, and {@code --insecure} is honoured only for a loopback broker (127.0.0.0/8,
 * ::1, localhost) — it then prints {@link #INSECURE_BANNER}. Deciding on the literal host means no
 * name is ever resolved over the network.
 */
public final class AuthPolicy {
    /** Printed (to stderr and the log) whenever a process runs with --insecure. */
    public static final String INSECURE_BANNER = String.join(System.lineSeparator(),
            "******************************************************************************",
            "*  INSECURE MODE: no broker authentication, no TLS, unsigned commands        *",
            "*  accepted. Anyone who can reach the broker can send raise/lower pulses.    *",
            "*  Allowed only because the broker is on loopback. Never use on a network.   *",
            "******************************************************************************");

    /**
     * What the process was given.
     *
     * @param brokerUri      e.g. {@code tcp://127.0.0.1:1883} or {@code ssl://gw.example:8883}
     * @param insecure       whether {@code --insecure} was given
     * @param hasCredentials whether a broker username and password were given
     * @param hasKeys        whether command keys were loaded (controller signs, plant verifies)
     */
    public record Settings(String brokerUri, boolean insecure, boolean hasCredentials, boolean hasKeys) {
    }

    /**
     * @param allowed  whether the process may start
     * @param insecure whether it runs in insecure mode (print the banner)
     * @param problems why it may not start, or what insecure mode gives up; each names the fix
     */
    public record Decision(boolean allowed, boolean insecure, List<String> problems) {
        public Decision {
            problems = List.copyOf(problems);
        }

        /** @return one message for the user: the problems, or the banner in insecure mode */
        public String message() {
            if (insecure && allowed) {
                return INSECURE_BANNER;
            }
            return allowed ? "security: broker auth, TLS and command signing in force"
                    : "refusing to start: " + String.join("; ", problems);
        }
    }

    private AuthPolicy() {
    }

    /**
     * Decides per broker node: a comma-separated list of cluster nodes ({@link BrokerEndpoints}) counts as
     * loopback only when every node is, and each node that is off loopback must be {@code ssl://}.
     *
     * @return the decision for those settings; never throws for a bad URI (refuses instead)
     */
    public static Decision decide(Settings s) {
        BrokerEndpoints nodes;
        try {
            nodes = BrokerEndpoints.parse(s.brokerUri());
        } catch (IllegalArgumentException e) {
            return new Decision(false, s.insecure(), List.of("broker URI '" + s.brokerUri() + "' is not valid: "
                    + e.getMessage()));
        }
        List<String> offLoopback = nodes.hosts().stream().filter(h -> !isLoopback(h)).toList();
        List<String> problems = new ArrayList<>();
        if (s.insecure()) {
            if (!offLoopback.isEmpty()) {
                problems.add("--insecure is allowed only with a loopback broker (127.0.0.1, ::1, localhost), not "
                        + String.join(", ", offLoopback));
                return new Decision(false, true, problems);
            }
            return new Decision(true, true, List.of("no broker auth, no TLS, unsigned commands accepted"));
        }
        if (!s.hasCredentials()) {
            problems.add("no broker username/password given (or pass --insecure on loopback)");
        }
        if (!nodes.isTls() && !offLoopback.isEmpty()) {
            problems.add("broker " + String.join(", ", offLoopback) + (offLoopback.size() > 1 ? " are" : " is")
                    + " not loopback: use an ssl:// URL for every node so passwords and commands are not sent in the clear");
        }
        if (!s.hasKeys()) {
            problems.add("no command keys (set " + KeyRing.KEYS_FILE_ENV + " or --keys FILE; or --insecure on loopback)");
        }
        return new Decision(problems.isEmpty(), false, problems);
    }

    /**
     * Whether a broker URI, or a comma-separated list of cluster nodes ({@link BrokerEndpoints}), is on
     * loopback: true only when the list parses and every node's host is {@link #isLoopback loopback}.
     * No name is resolved.
     *
     * @param brokerUriList e.g. {@code tcp://127.0.0.1:1883} or {@code tcp://127.0.0.1:1883,tcp://[::1]:1884}
     * @return false for a null, blank or invalid list, or when any node is off loopback
     */
    public static boolean isLoopbackBroker(String brokerUriList) {
        try {
            return BrokerEndpoints.parse(brokerUriList).hosts().stream().allMatch(AuthPolicy::isLoopback);
        } catch (IllegalArgumentException e) {
            return false;
        }
    }

    /** @return whether {@code host} is a loopback literal (127.0.0.0/8, ::1) or {@code localhost}; no name is resolved */
    public static boolean isLoopback(String host) {
        if (host == null || host.isEmpty()) {
            return false;
        }
        String h = host.startsWith("[") && host.endsWith("]") ? host.substring(1, host.length() - 1) : host;
        if (h.equalsIgnoreCase("localhost")) {
            return true;
        }
        boolean literal = h.matches("[0-9.]+") || h.contains(":");
        if (!literal) {
            return false;
        }
        try {
            return InetAddress.getByName(h).isLoopbackAddress(); // a literal: parsed, not resolved
        } catch (UnknownHostException e) {
            return false;
        }
    }
}
