package org.loopstand.protocol.testing;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;

/**
 * Which real brokers a test run can reach, said in one line: the machine's Mosquitto on 127.0.0.1:1883 (the
 * real-broker tests fail without it), the embedded HiveMQ CE (started in the test JVM on free ports where the
 * module has it) and a Docker engine (Testcontainers tests skip without one).
 */
public final class BrokerCensus {
    static final String HIVEMQ_CLASS = "com.hivemq.embedded.EmbeddedHiveMQ";
    private static final Path DOCKER_SOCKET = Path.of("/var/run/docker.sock");
    /** Short so the census costs well under 100 ms when the port is filtered; a refused loopback connect is instant. */
    private static final int PROBE_TIMEOUT_MS = 200;

    private BrokerCensus() {
    }

    /** What was found; a plain record so the wording can be checked without a machine. */
    public record Findings(boolean mosquittoFound, boolean hivemqOnClassPath, boolean dockerEngine) {
    }

    /** Probes this machine and this test class path. */
    public static Findings probe(Map<String, String> env) {
        boolean docker = env.get("DOCKER_HOST") != null && !env.get("DOCKER_HOST").isBlank()
                || Files.exists(DOCKER_SOCKET);
        return new Findings(FreePort.isOpen(Mosquitto.SYSTEM_PORT, PROBE_TIMEOUT_MS), onClassPath(HIVEMQ_CLASS), docker);
    }

    /** @return the one line printed at the start of a module's test run */
    public static String line(Findings f) {
        String at = "127.0.0.1:" + Mosquitto.SYSTEM_PORT;
        String mosquitto = f.mosquittoFound()
                ? "Mosquitto on " + at + " found (real-broker tests use it)"
                : "Mosquitto NOT found on " + at + ": the real-broker tests will fail; start it with"
                        + " 'apt-get install mosquitto' then 'mosquitto -d -c /etc/mosquitto/mosquitto.conf' (or .ci/run)";
        String hivemq = f.hivemqOnClassPath()
                ? "embedded HiveMQ CE started by the tests on free ports"
                : "no embedded HiveMQ CE in this module";
        String docker = f.dockerEngine()
                ? "Docker engine found (Testcontainers tests run)"
                : "no Docker engine (Testcontainers tests skip)";
        return "brokers: " + mosquitto + "; " + hivemq + "; " + docker;
    }

    private static boolean onClassPath(String className) {
        try {
            Class.forName(className, false, BrokerCensus.class.getClassLoader());
            return true;
        } catch (ClassNotFoundException | LinkageError e) {
            return false;
        }
    }
}
