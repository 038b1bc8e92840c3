package org.loopstand.protocol.testing;

/**
 * The machine's shared Mosquitto on 127.0.0.1:1883 (started by .ci/run). Tests use it read-only: never
 * stop or reconfigure it; isolate by unique topics and client ids, and clear retained topics after use.
 */
public final class Mosquitto {
    public static final int SYSTEM_PORT = 1883;

    private Mosquitto() {
    }

    /**
     * @return tcp://127.0.0.1:1883
     * @throws AssertionError when nothing listens there: real-broker tests must run, not be skipped
     */
    public static String system() {
        if (!FreePort.isOpen(SYSTEM_PORT)) {
            throw new AssertionError("no MQTT broker on 127.0.0.1:" + SYSTEM_PORT + ": real-broker tests need the"
                    + " system Mosquitto (install the 'mosquitto' package, or run .ci/run which starts it)");
        }
        return "tcp://127.0.0.1:" + SYSTEM_PORT;
    }
}
