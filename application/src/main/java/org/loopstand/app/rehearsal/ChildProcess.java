package org.loopstand.app.rehearsal;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;
import java.util.function.Predicate;

import org.loopstand.protocol.time.SystemTime;

/**
 * One rehearsal process (plant or controller) started as its own JVM. Its stdout and stderr go to a
 * log file in the run folder; each stdout line is also offered to a listener so the rehearsal can
 * wait for "ready" lines. Stopping sends SIGTERM first so the child's shutdown hook closes its
 * journal, and kills it only after a grace period.
 */
final class ChildProcess implements AutoCloseable {
    private final String name;
    private final Process process;
    private final CompletableFuture<String> ready = new CompletableFuture<>();
    private final List<String> lastLines = new ArrayList<>();
    /** True when the child leads its own process group (started through setsid): stop signals the group. */
    private volatile boolean ownGroup;

    private ChildProcess(String name, Process process) {
        this.name = name;
        this.process = process;
    }

    /**
     * @param name        short name for messages ("plant", "controller")
     * @param command     full command line
     * @param logFile     where the child's output is copied
     * @param readyLine   a stdout line that says the child is ready
     * @param lineSink    also told every stdout line (progress), may be a no-op
     */
    static ChildProcess start(String name, List<String> command, Path logFile, Predicate<String> readyLine,
                              Consumer<String> lineSink) {
        return start(name, new ProcessBuilder(command), logFile, readyLine, lineSink);
    }

    /** Same, from a prepared builder (working directory, environment); output is merged into the log. */
    static ChildProcess start(String name, ProcessBuilder pb, Path logFile, Predicate<String> readyLine,
                              Consumer<String> lineSink) {
        pb.redirectErrorStream(true);
        Process p;
        try {
            p = pb.start();
        } catch (IOException e) {
            throw new UncheckedIOException("could not start the " + name + " process: " + e.getMessage(), e);
        }
        ChildProcess child = new ChildProcess(name, p);
        Thread pump = new Thread(() -> child.pump(logFile, readyLine, lineSink), name + "-output");
        pump.setDaemon(true);
        pump.start();
        return child;
    }

    private void pump(Path logFile, Predicate<String> readyLine, Consumer<String> lineSink) {
        try (BufferedReader in = new BufferedReader(new InputStreamReader(process.getInputStream(), StandardCharsets.UTF_8));
             Writer log = Files.newBufferedWriter(logFile, StandardCharsets.UTF_8)) {
            String line;
            while ((line = in.readLine()) != null) {
                log.write(line);
                log.write('\n');
                log.flush();
                synchronized (lastLines) {
                    lastLines.add(line);
                    if (lastLines.size() > 20) {
                        lastLines.remove(0);
                    }
                }
                if (!ready.isDone() && readyLine.test(line)) {
                    ready.complete(line);
                }
                lineSink.accept(line);
            }
        } catch (IOException e) {
            // The child's pipe closes when it dies; the exit code tells the rest.
        } finally {
            ready.completeExceptionally(new IllegalStateException(name + " exited before it was ready"));
        }
    }

    /** Waits for the ready line; fails with the child's last output if it exits or times out first. */
    String awaitReady(long timeoutMs) {
        try {
            return ready.get(timeoutMs, TimeUnit.MILLISECONDS);
        } catch (java.util.concurrent.TimeoutException e) {
            throw new IllegalStateException("the " + name + " process was not ready within " + timeoutMs / 1000
                    + " s; its last output:\n" + tail(), e);
        } catch (java.util.concurrent.ExecutionException e) {
            throw new IllegalStateException("the " + name + " process exited"
                    + exitCode().map(c -> " with code " + c).orElse("") + " before it was ready; its last output:\n" + tail(), e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while waiting for the " + name + " process", e);
        }
    }

    /** Marks the child as the leader of its own process group (pid = group id); returns this. */
    ChildProcess ownGroup() {
        this.ownGroup = true;
        return this;
    }

    /** Writes one line to the child's stdin. */
    void sendLine(String line) {
        try {
            var in = process.getOutputStream();
            in.write((line + "\n").getBytes(StandardCharsets.UTF_8));
            in.flush();
        } catch (IOException e) {
            throw new UncheckedIOException("could not write to the " + name + " process: " + e.getMessage(), e);
        }
    }

    String name() {
        return name;
    }

    boolean isAlive() {
        return process.isAlive();
    }

    long pid() {
        return process.pid();
    }

    Optional<Integer> exitCode() {
        return process.isAlive() ? Optional.empty() : Optional.of(process.exitValue());
    }

    /** @return the child's last lines of output, for error messages */
    String tail() {
        synchronized (lastLines) {
            return lastLines.isEmpty() ? "  (no output)" : "  " + String.join("\n  ", lastLines);
        }
    }

    /** Waits for the child to end by itself; true if it did within the time. */
    boolean awaitExit(long timeoutMs) {
        try {
            return process.waitFor(timeoutMs, TimeUnit.MILLISECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    /**
     * SIGTERM to the child and everything it started (its process group when it has one of its own, so
     * processes left behind by a dead shell are reached too), then SIGKILL after {@code graceMs}.
     */
    void stop(long graceMs) {
        List<ProcessHandle> tree = new ArrayList<>(process.descendants().toList());
        if (ownGroup) {
            signalGroup("TERM");
        }
        tree.forEach(ProcessHandle::destroy);
        if (process.isAlive()) {
            process.destroy();
        }
        long deadline = SystemTime.wallMonotonicNanos() + graceMs * 1_000_000L;
        for (ProcessHandle h : tree) {
            try {
                h.onExit().get(Math.max(1, (deadline - SystemTime.wallMonotonicNanos()) / 1_000_000L), TimeUnit.MILLISECONDS);
            } catch (Exception e) {
                h.destroyForcibly();
            }
        }
        if (!awaitExit(Math.max(1, (deadline - SystemTime.wallMonotonicNanos()) / 1_000_000L))) {
            process.destroyForcibly();
            awaitExit(2_000);
        }
        if (ownGroup && groupAlive()) {
            WallWait.millis(Math.max(0, (deadline - SystemTime.wallMonotonicNanos()) / 1_000_000L), this::groupAlive);
            signalGroup("KILL");
        }
    }

    private void signalGroup(String signal) {
        try {
            new ProcessBuilder("kill", "-" + signal, "--", "-" + process.pid()).redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start().waitFor(5, TimeUnit.SECONDS);
        } catch (IOException e) {
            // no kill command: the descendants were signalled one by one above
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** @return true while any process of the child's group is alive (its pid is the group id) */
    private boolean groupAlive() {
        try {
            return new ProcessBuilder("kill", "-0", "--", "-" + process.pid()).redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start().waitFor() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    @Override
    public void close() {
        stop(5_000);
    }
}
