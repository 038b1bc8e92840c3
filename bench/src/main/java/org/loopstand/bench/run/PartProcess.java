package org.loopstand.bench.run;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;

/**
 * A plant or controller process of the bench (layout processes): this JVM's java and class path with
 * {@code bench bus-part}, its output in {@code part-ROLE.log}, orders on its standard input.
 */
final class PartProcess implements AutoCloseable {
    private final String role;
    private final Process process;
    private final PrintWriter orders;
    private final CompletableFuture<String> ready = new CompletableFuture<>();
    private final CompletableFuture<Void> done = new CompletableFuture<>();

    private PartProcess(String role, Process process, Path log) {
        this.role = role;
        this.process = process;
        this.orders = new PrintWriter(process.getOutputStream(), true, StandardCharsets.UTF_8);
        Thread t = new Thread(() -> pump(log), "bench-part-" + role + "-out");
        t.setDaemon(true);
        t.start();
    }

    static PartProcess start(String role, List<String> partMain, BenchSettings s, Path settingsFile, String siteId,
                             String serverUri)
            throws IOException {
        return start(List.of(), role, role, partMain, s, settingsFile, siteId, serverUri, List.of());
    }

    /**
     * @param prefix   what the java command is run under (e.g. {@code ip netns exec HOST}: it execs java, so the
     *                 process's pid is the JVM's), may be empty
     * @param name     the part's name (its log and figures files), e.g. {@code units-b}
     * @param role     plant, controller or units
     * @param moreArgs further arguments of the part's command line
     */
    static PartProcess start(List<String> prefix, String name, String role, List<String> partMain, BenchSettings s,
                             Path settingsFile, String siteId, String serverUri, List<String> moreArgs) throws IOException {
        List<String> cmd = new ArrayList<>(prefix);
        cmd.add(ProcessHandle.current().info().command().orElse("java"));
        for (String o : s.partJvmOpts().trim().split("\\s+")) {
            if (!o.isEmpty()) {
                cmd.add(o.replace("{role}", name));
            }
        }
        cmd.addAll(List.of("-cp", System.getProperty("java.class.path")));
        cmd.addAll(partMain);
        cmd.addAll(List.of("--role", role, "--settings", settingsFile.toString(), "--site-id", siteId, "--broker-uri", serverUri));
        cmd.addAll(moreArgs);
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).start();
        return new PartProcess(name, p, s.outDir().resolve("part-" + name + ".log"));
    }

    private void pump(Path log) {
        try (BufferedReader r = new BufferedReader(new InputStreamReader(process.getInputStream(), StandardCharsets.UTF_8));
             Writer w = Files.newBufferedWriter(log, StandardCharsets.UTF_8)) {
            for (String line; (line = r.readLine()) != null; ) {
                w.write(line);
                w.write('\n');
                w.flush();
                if (line.startsWith(BusPart.READY)) {
                    ready.complete(line);
                } else if (line.startsWith(BusPart.DONE)) {
                    done.complete(null);
                }
            }
        } catch (IOException e) {
            // the process ended
        }
        ready.completeExceptionally(new IllegalStateException(role + " process ended before it was ready; see part-"
                + role + ".log"));
        done.completeExceptionally(new IllegalStateException(role + " process ended before writing its figures; see part-"
                + role + ".log"));
    }

    /** @return the process's ready line */
    String awaitReady(long timeoutS) throws Exception {
        try {
            return ready.get(timeoutS, TimeUnit.SECONDS);
        } catch (TimeoutException e) {
            throw new IllegalStateException(role + " process not ready within " + timeoutS + " s; see part-" + role + ".log");
        }
    }

    void order(String line) {
        orders.println(line);
    }

    void awaitDone(long timeoutS) throws Exception {
        done.get(timeoutS, TimeUnit.SECONDS);
        process.waitFor(timeoutS, TimeUnit.SECONDS);
    }

    long pid() {
        return process.pid();
    }

    @Override
    public void close() {
        orders.close();
        if (process.isAlive()) {
            process.destroy();
            try {
                if (!process.waitFor(10, TimeUnit.SECONDS)) {
                    process.destroyForcibly();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
