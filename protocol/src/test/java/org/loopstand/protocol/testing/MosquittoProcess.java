package org.loopstand.protocol.testing;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * A private Mosquitto for tests that stop, kill, pause or reconfigure the broker: its own config in a
 * temp dir, listening on 127.0.0.1 on a free port that stays the same across {@link #restart()}.
 */
public final class MosquittoProcess implements AutoCloseable {
    public static final Path BINARY = Path.of("/usr/sbin/mosquitto");
    private static final long START_TIMEOUT_MS = 5_000;

    private final Path config;
    private final Path log;
    private final int port;
    private Process process;

    private MosquittoProcess(Path dir, int port, List<String> extraConfigLines) throws IOException {
        this.port = port;
        this.config = dir.resolve("mosquitto-" + port + ".conf");
        this.log = dir.resolve("mosquitto-" + port + ".log");
        List<String> lines = new ArrayList<>(List.of(
                "listener " + port + " 127.0.0.1",
                "allow_anonymous true",
                "persistence false",
                "max_queued_messages 100000",
                "log_dest stderr",
                "log_type error",
                "log_type warning"));
        lines.addAll(extraConfigLines);
        Files.write(config, lines);
    }

    /** Starts a broker with the rig's defaults on a free port. */
    public static MosquittoProcess start(Path tempDir) {
        return start(tempDir, List.of());
    }

    /** @param extraConfigLines more mosquitto.conf lines, e.g. "max_inflight_messages 2" */
    public static MosquittoProcess start(Path tempDir, List<String> extraConfigLines) {
        if (!Files.isExecutable(BINARY)) {
            throw new AssertionError(BINARY + " is missing: install the 'mosquitto' package");
        }
        try {
            MosquittoProcess m = new MosquittoProcess(tempDir, FreePort.find(), extraConfigLines);
            m.launch();
            return m;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    public int port() {
        return port;
    }

    public String serverUri() {
        return "tcp://127.0.0.1:" + port;
    }

    public boolean isRunning() {
        return process != null && process.isAlive();
    }

    /** Stops with SIGTERM (clean broker shutdown). */
    public void stop() {
        end(false);
    }

    /** Stops with SIGKILL: no cleanup, clients see their connections die. */
    public void kill() {
        end(true);
    }

    /** Starts again on the same port (stops first if running). */
    public void restart() {
        stop();
        try {
            launch();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Freezes the broker (SIGSTOP): connections stay open but nothing is answered. */
    public void pause() {
        signal("STOP");
    }

    /** Lets a {@link #pause() paused} broker run again (SIGCONT). */
    public void resume() {
        signal("CONT");
    }

    @Override
    public void close() {
        if (process != null && process.isAlive()) {
            resume();
        }
        stop();
    }

    private void launch() throws IOException {
        process = new ProcessBuilder(BINARY.toString(), "-c", config.toString())
                .redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.appendTo(log.toFile()))
                .start();
        for (int i = 0; i < START_TIMEOUT_MS / 50; i++) {
            if (!process.isAlive()) {
                throw new AssertionError("mosquitto exited with " + process.exitValue() + "; log " + log + ":\n"
                        + Files.readString(log));
            }
            if (FreePort.isOpen(port)) {
                return;
            }
            pauseMs(50);
        }
        end(true);
        throw new AssertionError("mosquitto did not open 127.0.0.1:" + port + " within " + START_TIMEOUT_MS + " ms");
    }

    private void end(boolean forcibly) {
        if (process == null || !process.isAlive()) {
            return;
        }
        if (forcibly) {
            process.destroyForcibly();
        } else {
            process.destroy();
        }
        try {
            if (!process.waitFor(5, TimeUnit.SECONDS)) {
                process.destroyForcibly().waitFor(5, TimeUnit.SECONDS);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private void signal(String name) {
        if (process == null || !process.isAlive()) {
            return;
        }
        try {
            Process k = new ProcessBuilder("kill", "-" + name, Long.toString(process.pid())).start();
            if (!k.waitFor(5, TimeUnit.SECONDS) || k.exitValue() != 0) {
                throw new AssertionError("kill -" + name + " " + process.pid() + " failed");
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private static void pauseMs(long ms) {
        try {
            Thread.sleep(ms);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
