package org.loopstand.controller.runtime;

import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;
import java.util.function.Supplier;

import org.HdrHistogram.Histogram;
import org.loopstand.protocol.metrics.JvmFigures;
import org.loopstand.protocol.metrics.PrometheusText;

/**
 * The controller's counters and its {@code /metrics} page (Prometheus text): cycles by state, cycle
 * duration and start jitter, commands sent by kind, acks by outcome, intake messages and rejections
 * by reason, JVM figures. Written on the agent thread, read on the HTTP thread. Names and units:
 * docs/live-view.md.
 */
public final class ControllerMetrics implements Supplier<String> {
    private static final long MAX_US = 3_600_000_000L;

    private final Map<String, LongAdder> cycles = new ConcurrentHashMap<>();
    private final Map<String, LongAdder> commands = new ConcurrentHashMap<>();
    private final Histogram cycleDurationUs = new Histogram(MAX_US, 3);
    private final Histogram jitterUs = new Histogram(MAX_US, 3);
    private ControllerAgent agent;

    /** Agent thread: one control cycle ran. */
    void cycle(String state, long durationNanos, long jitterNanos) {
        cycles.computeIfAbsent(state, k -> new LongAdder()).increment();
        synchronized (this) {
            cycleDurationUs.recordValue(Math.min(MAX_US, Math.max(0, durationNanos / 1000)));
            jitterUs.recordValue(Math.min(MAX_US, Math.abs(jitterNanos) / 1000));
        }
    }

    /** Agent thread: one command handed to the bus. */
    void commandSent(String kind) {
        commands.computeIfAbsent(kind, k -> new LongAdder()).increment();
    }

    void attach(ControllerAgent a) {
        this.agent = a;
    }

    @Override
    public String get() {
        PrometheusText page = new PrometheusText();
        page.counter("loopstand_controller_cycles_total", "control cycles run, by the state they ended in");
        copy(cycles).forEach((state, n) -> page.sample(n, "state", state));
        page.counter("loopstand_controller_commands_sent_total", "commands handed to the bus, by kind");
        copy(commands).forEach((kind, n) -> page.sample(n, "kind", kind));
        if (agent != null) {
            page.counter("loopstand_controller_acks_total", "command acks received, by outcome");
            agent.intake().acksByOutcome().forEach((outcome, n) -> page.sample(n, "outcome", outcome));
            page.counter("loopstand_controller_intake_rejected_total", "inputs the intake rejected, by reason");
            new TreeMap<>(agent.intake().rejectedByReason()).forEach((reason, n) -> page.sample(n, "reason", reason));
            page.counter("loopstand_controller_intake_messages_total", "messages routed by the intake")
                    .sample(agent.intake().messagesRouted());
            page.gauge("loopstand_controller_link_up", "1 when the controller's bus link is up").sample(agent.linkUp() ? 1 : 0);
        }
        Histogram duration;
        Histogram jitter;
        synchronized (this) {
            duration = cycleDurationUs.copy();
            jitter = jitterUs.copy();
        }
        page.summaryOfMicros("loopstand_controller_cycle_duration_seconds", "time one control cycle's decision took, s",
                duration);
        page.summaryOfMicros("loopstand_controller_cycle_jitter_seconds", "how far a cycle started from its due time, s",
                jitter);
        JvmFigures.writeTo(page);
        return page.text();
    }

    private static Map<String, Long> copy(Map<String, LongAdder> m) {
        Map<String, Long> out = new TreeMap<>();
        m.forEach((k, v) -> out.put(k, v.sum()));
        return out;
    }
}
