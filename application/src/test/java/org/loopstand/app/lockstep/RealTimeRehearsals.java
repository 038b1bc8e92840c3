package org.loopstand.app.lockstep;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CancellationException;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.LockSupport;

import org.loopstand.app.rehearsal.Rehearsal;
import org.loopstand.app.rehearsal.RehearsalSettings;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.run.RunFolder;
import org.loopstand.report.run.RunReportBuilder;

/**
 * Real-time rehearsals of several scenarios, a few at a time: each a plant and a built-in controller as
 * child JVMs of this one (its class path holds both), its own embedded broker on its own loopback port,
 * its own run folder. Queued at once, longest scenario first, one starting at a time, so the test thread
 * can do other work (the lockstep runs) while they go.
 */
final class RealTimeRehearsals implements AutoCloseable {
    /** What one rehearsal gave: its outcome, the report read back from its run folder (null if none), what it printed. */
    record Rehearsed(Rehearsal.Outcome outcome, ReportModel report, String printed) {
    }

    /** One scenario to rehearse: its file, its site file, its length in scenario seconds (for the order). */
    record Planned(Path scenarioFile, Path siteFile, double durationS) {
    }

    private final ExecutorService pool;
    private final List<Rehearsal> planned = new ArrayList<>();
    private final List<Rehearsal> started = new CopyOnWriteArrayList<>();
    private final Map<Path, CompletableFuture<Rehearsed>> results = new LinkedHashMap<>();
    private volatile boolean closing;
    /**
     * One rehearsal starting at a time: four plants starting their embedded brokers at once on a busy
     * 2-core machine took more than the plant's 30 s broker start limit (3 of 11 in one run).
     */
    private final Semaphore startGate = new Semaphore(1);

    /**
     * Starts every planned rehearsal on a pool of {@code atOnce} threads.
     *
     * @param rate   scenario seconds per wall second, as {@code rehearse --rate}
     * @param atOnce how many rehearsals run at the same time, ≥ 1
     */
    RealTimeRehearsals(List<Planned> planned, double rate, int atOnce, Path runsDir) throws IOException {
        pool = Executors.newFixedThreadPool(atOnce, r -> {
            Thread t = new Thread(r, "real-time-rehearsal");
            t.setDaemon(true);
            return t;
        });
        List<Planned> longestFirst = new ArrayList<>(planned);
        longestFirst.sort(Comparator.comparingDouble(Planned::durationS).reversed());
        List<Integer> ports = distinctFreePorts(longestFirst.size());
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        String cp = System.getProperty("java.class.path");
        for (int i = 0; i < longestFirst.size(); i++) {
            Planned p = longestFirst.get(i);
            Path dir = Files.createDirectories(runsDir.resolve(String.valueOf(p.scenarioFile().getFileName()).replace(".yaml", "")));
            RehearsalSettings s = new RehearsalSettings(p.scenarioFile(), p.siteFile(), null, rate, dir, java, cp, cp,
                    ports.get(i), 120_000, List.of(), Path.of(".."));
            ByteArrayOutputStream printed = new ByteArrayOutputStream();
            Rehearsal r = new Rehearsal(s, WallClock.INSTANCE, new PrintStream(printed, true, StandardCharsets.UTF_8), false);
            this.planned.add(r);
            results.put(p.scenarioFile(), CompletableFuture.supplyAsync(() -> {
                if (closing) {
                    throw new CancellationException("closed before it started");
                }
                started.add(r);
                long startNanos = WallClock.INSTANCE.monotonicNanos();
                Rehearsal.Outcome o = runThroughTheStartGate(r);
                long wallS = (WallClock.INSTANCE.monotonicNanos() - startNanos) / 1_000_000_000L;
                String out = printed.toString(StandardCharsets.UTF_8);
                // one line per rehearsal in the test output: what CI time and a changed verdict are judged by
                System.out.println("real-time rehearsal " + s.scenarioName() + " at rate " + rate + ": " + wallS + " s wall, "
                        + out.lines().filter(l -> l.startsWith("verdict:") || l.contains("RATE NOT KEPT")).map(String::trim).toList()
                        + commandPath(o.runFolder()));
                ReportModel report = o.report() == null ? null
                        : RunReportBuilder.build(RunFolder.read(o.runFolder()), Map.of(), List.of(), "test");
                return new Rehearsed(o, report, out);
            }, pool));
        }
    }

    /**
     * @return the plant's account of the command path, for the line printed per rehearsal: command outcomes,
     *         the pace keeper's command-path slow-downs and the oldest command on arrival (scenario s)
     */
    private static String commandPath(Path runFolder) {
        Path journal = runFolder == null ? null : runFolder.resolve("plant.jsonl");
        if (journal == null || !Files.isRegularFile(journal)) {
            return "";
        }
        Map<String, Integer> outcomes = new java.util.TreeMap<>();
        Object slowdowns = null;
        Object maxAgeS = null;
        try (var lines = Files.lines(journal)) {
            for (String line : (Iterable<String>) lines::iterator) {
                if (line.contains("\"kind\":\"command\"") || line.contains("\"paceSummary\"")) {
                    Map<?, ?> e = JSON.readValue(line, Map.class);
                    if ("command".equals(e.get("kind"))) {
                        outcomes.merge(String.valueOf(e.get("outcome")), 1, Integer::sum);
                    } else if ("paceSummary".equals(e.get("event"))) {
                        slowdowns = e.get("commandPathSlowdowns");
                        maxAgeS = e.get("maxCommandAgeS");
                    }
                }
            }
        } catch (IOException e) {
            return " (plant journal not read: " + e + ")";
        }
        return " commands " + outcomes + ", command-path slow-downs " + slowdowns + ", oldest command " + maxAgeS + " s";
    }

    private static final com.fasterxml.jackson.databind.ObjectMapper JSON = new com.fasterxml.jackson.databind.ObjectMapper();

    /** Runs the rehearsal, holding the start gate until its controller runs (the plant and its broker are up) or it ended. */
    private Rehearsal.Outcome runThroughTheStartGate(Rehearsal r) {
        startGate.acquireUninterruptibly();
        boolean released = false;
        try {
            CompletableFuture<Rehearsal.Outcome> run = CompletableFuture.supplyAsync(r::run, runnable -> {
                Thread t = new Thread(runnable, "rehearsal");
                t.setDaemon(true);
                t.start();
            });
            while (!run.isDone() && r.pidOf("controller").isEmpty()) {
                LockSupport.parkNanos(100_000_000L);
            }
            startGate.release();
            released = true;
            return run.join();
        } finally {
            if (!released) {
                startGate.release();
            }
        }
    }

    /** @return the rehearsal of this scenario file, waited for up to {@code timeoutS} */
    Rehearsed await(Path scenarioFile, long timeoutS) throws Exception {
        CompletableFuture<Rehearsed> f = results.get(scenarioFile);
        if (f == null) {
            throw new IllegalArgumentException(scenarioFile + " was not rehearsed");
        }
        return f.get(timeoutS, TimeUnit.SECONDS);
    }

    /** Stops what still runs (a failed test must not leave child processes behind) and waits for it. */
    @Override
    public void close() throws InterruptedException {
        closing = true; // the ones not yet started never start
        planned.forEach(Rehearsal::abort);
        pool.shutdown();
        for (Rehearsal r : started) {
            r.awaitDone(60_000);
        }
    }

    /** Ports held open together while picked, so no two rehearsals are given the same one. */
    private static List<Integer> distinctFreePorts(int count) {
        List<ServerSocket> held = new ArrayList<>();
        try {
            List<Integer> ports = new ArrayList<>();
            for (int i = 0; i < count; i++) {
                ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress());
                held.add(s);
                ports.add(s.getLocalPort());
            }
            return ports;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } finally {
            for (ServerSocket s : held) {
                try {
                    s.close();
                } catch (IOException ignored) {
                    // closing a listening socket we own; nothing to do
                }
            }
        }
    }
}
