package org.loopstand.app.rehearsal;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;

import org.loopstand.protocol.codec.DecodeError;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Starts the controller under test and waits for it: one path for the built-in controller and any
 * user's command (a shell command run in the folder the rehearsal was started from, connection facts in {@code LOOPSTAND_*}
 * environment variables, output to {@code controller.log}), or, for an external controller, the exact
 * facts it must connect with. Ready means: the controller's first status with the accepted id arrived
 * on the bus after the rehearsal subscribed (a retained status left by an earlier run does not count).
 */
final class ControllerLaunch {
    /** Environment variables a controller command gets (docs/controller-contract.md). */
    static final List<String> ENVIRONMENT = List.of("LOOPSTAND_BROKER_URL", "LOOPSTAND_SITE_ID", "LOOPSTAND_SITE_FILE",
            "LOOPSTAND_TOPIC_ROOT", "LOOPSTAND_CONTROLLER_ID", "LOOPSTAND_RATE", "LOOPSTAND_RUN_DIR");

    private final ControllerUnderTest controller;
    private final MessageCodec codec = new MessageCodec();
    private final CompletableFuture<ControllerStatus> firstStatus = new CompletableFuture<>();
    private final Set<String> otherIds = new TreeSet<>();
    private final Set<String> wrongTopics = new TreeSet<>();
    private int undecodable;
    private DecodeError lastDecodeError;

    ControllerLaunch(ControllerUnderTest controller) {
        this.controller = controller;
    }

    /** @return the variables the controller command runs with */
    static Map<String, String> environment(RehearsalSettings s, String siteId, Path run) {
        Map<String, String> env = new LinkedHashMap<>();
        env.put("LOOPSTAND_BROKER_URL", s.effectiveBrokerUrl());
        env.put("LOOPSTAND_SITE_ID", siteId);
        env.put("LOOPSTAND_SITE_FILE", s.siteFile().toAbsolutePath().normalize().toString());
        env.put("LOOPSTAND_TOPIC_ROOT", TopicTree.forSite(siteId).root());
        env.put("LOOPSTAND_CONTROLLER_ID", s.controller().controllerId());
        env.put("LOOPSTAND_RATE", Rehearsal.trim(s.rate()));
        env.put("LOOPSTAND_RUN_DIR", run.toAbsolutePath().normalize().toString());
        if (s.wireProfile() != null) {
            env.put("LOOPSTAND_WIRE_PROFILE", s.wireProfile().toAbsolutePath().normalize().toString());
        }
        // the launcher runs the built-in controller from these instead of building (see ./loopstand)
        if (s.controllerClassPath() != null) {
            env.put("LOOPSTAND_CONTROLLER_CP", s.controllerClassPath());
        }
        env.put("LOOPSTAND_JAVA", s.javaCommand());
        return env;
    }

    /**
     * Starts the command through {@code sh -c} in the directory the rehearsal was started from, in a process group of its own
     * ({@code setsid}), so stopping it reaches every process the command started, even after the shell
     * itself died.
     */
    ChildProcess start(RehearsalSettings s, String siteId, Path run) {
        ProcessBuilder pb = new ProcessBuilder("setsid", "sh", "-c", controller.commandLine()).directory(s.commandDir().toFile());
        pb.environment().putAll(environment(s, siteId, run));
        return ChildProcess.start("controller", pb, run.resolve("controller.log"), l -> false, l -> { }).ownGroup();
    }

    /** @return what a user must give an external controller, one fact a line */
    static List<String> instructions(RehearsalSettings s, String siteId, Path run) {
        Map<String, String> env = environment(s, siteId, run);
        return List.of(
                "rehearsal: waiting for the external controller '" + s.controller().controllerId() + "' (at most "
                        + s.controllerWaitMs() / 1000 + " s). Start it now with:",
                "  broker        " + env.get("LOOPSTAND_BROKER_URL"),
                "  site          " + siteId + " (file " + env.get("LOOPSTAND_SITE_FILE") + ")",
                "  topic root    " + env.get("LOOPSTAND_TOPIC_ROOT"),
                "  controller id " + s.controller().controllerId() + " (commands from any other id are refused)",
                "  epoch         epoch ms, ≥ 0, at most a day ahead of scenario time; one per process, never lower",
                "  time base     scenario time from " + env.get("LOOPSTAND_TOPIC_ROOT") + "/clock (rate "
                        + env.get("LOOPSTAND_RATE") + "); every timestamp, validUntil included, is scenario epoch ms",
                "  run folder    " + env.get("LOOPSTAND_RUN_DIR") + " (put its journal or log here if you like)",
                "  The scenario starts when its first status arrives on "
                        + TopicTree.forSite(siteId).controllerStatus(s.controller().controllerId()) + ".");
    }

    /**
     * Bus thread: every controller status the rehearsal's own link receives. Ready takes what a unit would take as a
     * status of the accepted id: it decodes and its {@code controllerId} is the id of its topic (else the units refuse it,
     * {@code wrongTopic}). What was refused is kept, so a timeout can say what the controller did wrong.
     *
     * @param topic the topic it came on ({@code …/controller/{id}/status})
     */
    void onStatus(String topic, byte[] payload, boolean retained) {
        if (retained) {
            return; // left by an earlier run: not a sign of life
        }
        String topicId = TopicTree.parse(topic).map(p -> p.ids().get(0)).orElse("?");
        Decoded<ControllerStatus> d = codec.decode(payload, ControllerStatus.class);
        synchronized (otherIds) {
            if (d.rejection().isPresent()) {
                if (topicId.equals(controller.controllerId())) {
                    undecodable++;
                    lastDecodeError = d.rejection().get();
                }
                return;
            }
            ControllerStatus st = d.message().orElseThrow();
            if (st.controllerId().equals(controller.controllerId()) && topicId.equals(st.controllerId())) {
                firstStatus.complete(st);
            } else if (st.controllerId().equals(controller.controllerId())) {
                wrongTopics.add(topic);
            } else {
                otherIds.add(st.controllerId());
            }
        }
    }

    /** @return what arrived but did not count, for the timeout message; empty when nothing did */
    String refusedStatuses(String statusTopic) {
        StringBuilder b = new StringBuilder();
        synchronized (otherIds) {
            if (undecodable > 0) {
                b.append(String.format(Locale.ROOT, "; %d status%s on %s did not decode (the units refuse %s too), the last: %s"
                        + " (docs/messages.md, ControllerStatus)", undecodable, undecodable == 1 ? "" : "es", statusTopic,
                        undecodable == 1 ? "it" : "them", lastDecodeError));
            }
            if (!wrongTopics.isEmpty()) {
                b.append("; statuses with controllerId '").append(controller.controllerId()).append("' arrived on ")
                        .append(wrongTopics).append(", not on its own topic (the units refuse them: wrongTopic)");
            }
            if (!otherIds.isEmpty()) {
                b.append("; statuses did arrive from ").append(otherIds).append(", which is not the accepted id");
            }
        }
        return b.toString();
    }

    /**
     * Waits for the first status; fails with a message that says what to check.
     *
     * @param child the controller's process, or null for an external one
     */
    ControllerStatus awaitFirstStatus(long timeoutMs, ChildProcess child, String statusTopic,
                                      java.util.function.BooleanSupplier stopAsked) {
        long waitedMs = 0;
        while (true) {
            if (stopAsked.getAsBoolean()) {
                throw new IllegalStateException("stopped by Ctrl-C while waiting for the controller");
            }
            try {
                return firstStatus.get(Math.min(500, timeoutMs - waitedMs), TimeUnit.MILLISECONDS);
            } catch (TimeoutException e) {
                waitedMs += 500;
                if (child != null && !child.isAlive()) {
                    throw new IllegalStateException("the controller process exited" + child.exitCode().map(c -> " with code " + c)
                            .orElse("") + " before its first status; its last output:\n" + child.tail());
                }
                if (waitedMs >= timeoutMs) {
                    String others = refusedStatuses(statusTopic);
                    throw new IllegalStateException(String.format(Locale.ROOT, "no status from controller '%s' on %s within"
                            + " %d s%s. %s", controller.controllerId(), statusTopic, timeoutMs / 1000, others, others.isEmpty()
                            ? "Check that it connects to the broker given above and publishes its status there."
                            : "Statuses did arrive: fix what is named above.")
                            + (child == null ? "" : " Its last output:\n" + child.tail()));
                }
            } catch (ExecutionException e) {
                throw new IllegalStateException("waiting for the controller failed: " + e.getCause(), e);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted while waiting for the controller", e);
            }
        }
    }
}
