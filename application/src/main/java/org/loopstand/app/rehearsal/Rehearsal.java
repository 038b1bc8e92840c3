package org.loopstand.app.rehearsal;

import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.LockSupport;

import org.loopstand.plant.cli.PlantCli;
import org.loopstand.plant.profile.ProfiledBus;
import org.loopstand.plant.profile.WireProfileLoader;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;
import org.loopstand.report.html.HtmlReportWriter;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.run.RunFolder;
import org.loopstand.report.run.RunReportBuilder;

/**
 * One rehearsal: a run folder, the plant process (with the embedded broker unless an external one is
 * given), the controller process, progress on the terminal, a clean stop at the scenario's end, on
 * Ctrl-C ({@link #abort()}) or when a process dies, and the report. Children's output goes to
 * {@code plant.log} / {@code controller.log} in the run folder.
 */
public final class Rehearsal {
    /** What happened. */
    public record Outcome(int exitCode, Path runFolder, Path report, String message) {
    }


    private final RehearsalSettings s;
    private final Clock wall;
    private final PrintStream out;
    private final boolean terminal;
    private final CountDownLatch done = new CountDownLatch(1);
    private volatile boolean aborted;
    private volatile boolean plantDone;
    private volatile ChildProcess plantChild;
    private volatile ChildProcess controllerChild;
    private volatile String liveUrl;
    /** the plant's "RATE NOT KEPT: …" line, repeated under the verdict (docs/plant.md, "Pacing") */
    private volatile String rateNotKept;

    /**
     * @param wall     wall clock (names the run folder, paces progress)
     * @param out      where progress and messages go
     * @param terminal true to redraw one progress line with \r; false for a plain line every ~10 s
     */
    public Rehearsal(RehearsalSettings settings, Clock wall, PrintStream out, boolean terminal) {
        this.s = settings;
        this.wall = wall;
        this.out = out;
        this.terminal = terminal;
    }

    /** Asks a running rehearsal to stop both processes and write its report (Ctrl-C). Any thread. */
    public void abort() {
        aborted = true;
    }

    /** Waits for {@link #run()} to finish, at most {@code timeoutMs}; for a shutdown hook. */
    public boolean awaitDone(long timeoutMs) throws InterruptedException {
        return done.await(timeoutMs, TimeUnit.MILLISECONDS);
    }

    /** @return the pid of the running "plant" or "controller" process, if started (tests, diagnostics) */
    public java.util.OptionalLong pidOf(String process) {
        ChildProcess c = "plant".equals(process) ? plantChild : "controller".equals(process) ? controllerChild : null;
        return c == null ? java.util.OptionalLong.empty() : java.util.OptionalLong.of(c.pid());
    }

    public Outcome run() {
        try {
            return runOnce();
        } finally {
            done.countDown();
        }
    }

    private Outcome runOnce() {
        if (s.brokerUrl() == null && !PortProbe.isFree("127.0.0.1", s.embeddedPort())) {
            return fail(2, null, "port " + s.embeddedPort() + " on 127.0.0.1 is taken, so the plant cannot start its"
                    + " embedded broker there. Another broker or rehearsal is probably running: stop it (see `ss -ltnp"
                    + " | grep " + s.embeddedPort() + "`), or rehearse against a running broker with --broker URL.");
        }
        String siteId = topValue(s.siteFile(), "siteId");
        if (siteId == null) {
            return fail(2, null, "site file " + s.siteFile() + " has no top-level siteId");
        }
        double durationS = parseOr(topValue(s.scenarioFile(), "durationS"), Double.NaN);
        Path run = makeRunFolder();
        say("rehearsal: scenario " + s.scenarioFile() + " on site " + siteId + " at rate " + trim(s.rate())
                + (Double.isNaN(durationS) ? "" : String.format(Locale.ROOT, " (%.0f s of scenario, about %.0f s wall)",
                        durationS, durationS / s.rate()))
                + "; broker " + (s.brokerUrl() == null ? "embedded on " + s.effectiveBrokerUrl() : s.brokerUrl()));
        say("rehearsal: run folder " + run);
        ChildProcess plant = null;
        ChildProcess controller = null;
        MessageBus progressLink = null;
        ProgressView view = new ProgressView(durationS);
        List<String> notes = new ArrayList<>();
        int exit = 0;
        String message;
        try {
            plant = ChildProcess.start("plant", plantCommand(run), run.resolve("plant.log"),
                    l -> l.startsWith("plant: site "), l -> {
                        if (l.startsWith("plant: scenario done")) {
                            plantDone = true;
                        } else if (l.startsWith("plant: RATE NOT KEPT")) {
                            rateNotKept = l.substring("plant: ".length());
                        } else if (l.startsWith("live view: ")) {
                            liveUrl = l.substring("live view: ".length()).trim();
                            say(l); // the plant serves the live view; its address belongs on the terminal
                        }
                        view.onPlantLine(l);
                    });
            plantChild = plant;
            plant.awaitReady(s.readyTimeoutMs());
            ControllerLaunch launch = new ControllerLaunch(s.controller());
            progressLink = progressLink(siteId, view, launch);
            say("rehearsal: controller under test: " + s.controller().describe());
            if (s.controller().external()) {
                ControllerLaunch.instructions(s, siteId, run).forEach(this::say);
            } else {
                controller = launch.start(s, siteId, run);
                controllerChild = controller;
            }
            launch.awaitFirstStatus(s.controllerWaitMs(), controller,
                    TopicTree.forSite(siteId).controllerStatus(s.controller().controllerId()), () -> aborted);
            plant.sendLine("go"); // scenario time starts now that both are up
            say("rehearsal: plant (pid " + plant.pid() + ")" + (controller == null ? " and the external controller"
                    : " and controller (pid " + controller.pid() + ")") + " running; Ctrl-C stops "
                    + (controller == null ? "the plant" : "both") + " and still writes the report");
            message = watch(plant, controller, view, notes);
            exit = message == null ? 0 : aborted ? 130 : 1;
        } catch (IllegalStateException | UncheckedIOException e) {
            message = e.getMessage();
            notes.add(message);
            exit = 1;
        } finally {
            if (progressLink != null) {
                progressLink.close();
            }
            if (controller != null) {
                controller.stop(15_000); // SIGTERM: its shutdown hook closes its journal
            }
            if (plant != null && !(plantDone && liveView())) {
                plant.stop(20_000);
            }
        }
        if (terminal) {
            out.println();
        }
        if (rateNotKept != null) {
            notes.add("The plant could not keep the asked rate: " + rateNotKept);
        }
        ReportModel model = reportModel(run, notes);
        Path report = writeReport(model, run);
        if (message != null) {
            say("rehearsal: " + (exit == 130 ? "stopped: " : "FAILED: ") + message);
        } else {
            say("rehearsal: completed");
        }
        if (model != null) {
            VerdictLines.of(model).forEach(this::say);
            if (rateNotKept != null) {
                say("  " + rateNotKept);
            }
            if (exit == 0 && (model.verdict() == ReportModel.Verdict.FAIL || model.verdict() == ReportModel.Verdict.CUT_SHORT)) {
                exit = 1; // scripts can tell a failed rehearsal by its exit code alone
            }
        } else if (exit == 0) {
            exit = 1;
        }
        if (report != null) {
            say("report: " + report.toAbsolutePath());
        }
        if (plant != null && plantDone && liveView()) {
            holdLiveView(plant); // the plant's page links the report now; let the watchers follow it
        }
        return new Outcome(exit, run, report, message);
    }

    private boolean liveView() {
        return liveUrl != null;
    }

    private void holdLiveView(ChildProcess plant) {
        LiveViewHold.whilePagesOpen(liveUrl, wall, () -> aborted || !plant.isAlive(), this::say);
        plant.stop(20_000);
    }

    /** @return null when the scenario ran to its end, else why it did not */
    private String watch(ChildProcess plant, ChildProcess controller, ProgressView view, List<String> notes) {
        long lastPlainNanos = wall.monotonicNanos();
        while (true) {
            if (aborted) {
                notes.add(String.format(Locale.ROOT, "Stopped by the operator (Ctrl-C) at scenario time %.0f s.", view.scenarioS()));
                return "stopped by Ctrl-C at scenario time " + fmt(view.scenarioS()) + " s";
            }
            if (plantDone) {
                return null;
            }
            for (ChildProcess c : controller == null ? List.of(plant) : List.of(controller, plant)) {
                if (!c.isAlive()) {
                    c.awaitExit(1_000);
                    LockSupport.parkNanos(500_000_000L); // a Ctrl-C reaches the children too: let abort() land first
                    if (aborted || (c == plant && plantDone)) {
                        break;
                    }
                    if (c == controller && c.exitCode().orElse(-1) == 0 && (plantDone || view.runEnded())) {
                        // the controller stopped by itself on the plant's end-of-run signal, as the contract asks
                        WallWait.millis(30_000, () -> !plantDone && plant.isAlive());
                        return null;
                    }
                    String m = "the " + c.name() + " process died" + c.exitCode().map(x -> " (exit code " + x
                            + (x == 137 ? ", killed" : "") + ")").orElse("") + " at scenario time " + fmt(view.scenarioS())
                            + " s; its last output:\n" + c.tail();
                    notes.add("The " + c.name() + " process died" + c.exitCode().map(x -> " with exit code " + x).orElse("")
                            + " at scenario time " + fmt(view.scenarioS()) + " s; the run was cut short.");
                    return m;
                }
            }
            long now = wall.monotonicNanos();
            if (terminal) {
                out.print("\r" + view.line() + "\u001b[K");
                out.flush();
            } else if (now - lastPlainNanos >= 10_000_000_000L) {
                lastPlainNanos = now;
                say(view.line());
            }
            LockSupport.parkNanos(250_000_000L);
        }
    }

    private ReportModel reportModel(Path run, List<String> notes) {
        try {
            RunFolder folder = RunFolder.read(run);
            Map<String, String> config = new LinkedHashMap<>();
            config.put("scenario file", s.scenarioFile().toString());
            config.put("site file", s.siteFile().toString());
            config.put("rate", trim(s.rate()));
            config.put("broker", s.brokerUrl() == null ? "embedded, " + s.effectiveBrokerUrl() : s.brokerUrl());
            config.put("controller under test", s.controller().describe());
            return RunReportBuilder.build(folder, config, notes, PlantCli.VERSION);
        } catch (RuntimeException e) {
            say("rehearsal: the report could not be made: " + e.getMessage());
            return null;
        }
    }

    private Path writeReport(ReportModel model, Path run) {
        if (model == null) {
            return null;
        }
        try {
            Path report = run.resolve("report.html");
            HtmlReportWriter.write(model, report);
            return report;
        } catch (RuntimeException e) {
            say("rehearsal: the report could not be written: " + e.getMessage());
            return null;
        }
    }

    private MessageBus progressLink(String siteId, ProgressView view, ControllerLaunch launch) {
        TopicTree topics = TopicTree.forSite(siteId);
        MessageBus link = new MqttLink(MqttLinkConfig.builder().serverUri(s.effectiveBrokerUrl())
                .clientId("rehearsal-progress-" + ProcessHandle.current().pid()).build(), wall).start();
        if (s.wireProfile() != null) {
            // the rehearsal watches the bus as the controller sees it, read back into the rig's layout
            try {
                link = new ProfiledBus(link, WireProfileLoader.load(s.wireProfile(), siteId), (t, why) -> { });
            } catch (java.io.IOException e) {
                link.close();
                throw new UncheckedIOException("cannot read the wire profile " + s.wireProfile() + ": " + e.getMessage(), e);
            }
        }
        for (String filter : List.of(topics.clock(), topics.run(), topics.filterAll(TopicKind.CONTROLLER_STATUS),
                topics.filterAll(TopicKind.AREA_METER), topics.faults())) {
            link.subscribe(filter, Qos.AT_MOST_ONCE, m -> {
                view.onMessage(m.topic(), m.payload());
                if (filter.equals(topics.filterAll(TopicKind.CONTROLLER_STATUS))) {
                    launch.onStatus(m.topic(), m.payload(), m.retained());
                }
            });
        }
        return link;
    }

    List<String> plantCommand(Path run) {
        List<String> c = new ArrayList<>(List.of(s.javaCommand(), "-cp", s.plantClassPath(),
                PlantCli.class.getName(), "plant", "--site", s.siteFile().toString(),
                "--scenario", s.scenarioFile().toString(), "--rate", trim(s.rate()), "--journal", run.toString(),
                "--linger-s", "60", "--wait-go", "--accept-controller", s.controller().controllerId()));
        if (s.wireProfile() != null) {
            c.add("--wire-profile");
            c.add(s.wireProfile().toAbsolutePath().toString());
        }
        if (s.brokerUrl() != null) {
            c.add("--broker");
            c.add(s.brokerUrl());
        } else {
            c.add("--broker-port");
            c.add(Integer.toString(s.embeddedPort()));
        }
        c.addAll(s.extraPlantArgs());
        return c;
    }

    private Path makeRunFolder() {
        return newRunFolder(s.runsDir(), s.scenarioName(), wall);
    }

    /**
     * Creates {@code runsDir/<yyyyMMdd-HHmmss>-<name>} (local wall time), with a {@code -2}, {@code -3}…
     * suffix when it exists.
     */
    public static Path newRunFolder(Path runsDir, String name, Clock wall) {
        String stamp = DateTimeFormatter.ofPattern("yyyyMMdd-HHmmss", Locale.ROOT)
                .format(Instant.ofEpochMilli(wall.epochMillis()).atZone(ZoneId.systemDefault()));
        String base = stamp + "-" + name;
        try {
            Files.createDirectories(runsDir);
            for (int i = 1; ; i++) {
                Path p = runsDir.resolve(i == 1 ? base : base + "-" + i);
                try {
                    return Files.createDirectory(p);
                } catch (java.nio.file.FileAlreadyExistsException e) {
                    if (i > 100) {
                        throw e;
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create a run folder in " + runsDir + ": " + e.getMessage(), e);
        }
    }

    private Outcome fail(int code, Path run, String message) {
        say("rehearsal: FAILED: " + message);
        return new Outcome(code, run, null, message);
    }

    /** @return the site id a scenario names ({@code siteId:}, or the old spelling {@code site:}), or null */
    public static String scenarioSiteId(Path scenarioFile) {
        String id = topValue(scenarioFile, "siteId");
        return id != null ? id : topValue(scenarioFile, "site");
    }

    /** @return a top-level {@code key: value} of a YAML file, or null (also when not valid YAML: its reader says so) */
    public static String topValue(Path file, String key) {
        try {
            return YamlNode.topLevelText(file, key).orElse(null);
        } catch (ConfigFileException e) {
            return null;
        }
    }

    private static double parseOr(String v, double fallback) {
        try {
            return v == null ? fallback : Double.parseDouble(v);
        } catch (NumberFormatException e) {
            return fallback;
        }
    }

    private void say(String line) {
        out.println(line);
        out.flush();
    }

    private static String fmt(double s) {
        return Double.isNaN(s) ? "?" : String.format(Locale.ROOT, "%.0f", s);
    }

    static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }
}
