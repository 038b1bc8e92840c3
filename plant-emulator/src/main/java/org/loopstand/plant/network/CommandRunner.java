package org.loopstand.plant.network;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.TimeUnit;

/** Runs one system command (ip, tc) and says how it ended; a fake in tests. */
@FunctionalInterface
public interface CommandRunner {
    /** How a command ended: exit code (−1 when it could not run or timed out) and its output. */
    record Result(int exitCode, String output) {
        public boolean ok() {
            return exitCode == 0;
        }
    }

    Result run(List<String> command);

    /** Runs the command as a child process, output and errors together, at most 10 s. */
    CommandRunner SYSTEM = command -> {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).strip();
            if (!p.waitFor(10, TimeUnit.SECONDS)) {
                p.destroyForcibly();
                return new Result(-1, "no answer within 10 s");
            }
            return new Result(p.exitValue(), out);
        } catch (IOException e) {
            return new Result(-1, "could not run: " + e.getMessage());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return new Result(-1, "interrupted");
        }
    };
}
