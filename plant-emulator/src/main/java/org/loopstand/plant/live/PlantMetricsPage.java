package org.loopstand.plant.live;


import java.util.function.Supplier;

import org.loopstand.plant.runtime.PlantCounters;
import org.loopstand.plant.runtime.StepLateness;
import org.loopstand.protocol.metrics.JvmFigures;
import org.loopstand.protocol.metrics.PrometheusText;

/**
 * The plant's {@code /metrics} page (Prometheus text): messages sent and lost per kind and reason,
 * commands by kind and outcome, refusals by reason, step lateness, scenario time, live fault actions,
 * JVM figures. Names and units: docs/live-view.md.
 */
public final class PlantMetricsPage implements Supplier<String> {
    private final PlantCounters counters;
    private final StepLateness lateness;
    private final LiveFeed feed;
    private final LiveFaultDesk desk;

    /** @param desk the fault controls, or null when the page has none */
    public PlantMetricsPage(PlantCounters counters, StepLateness lateness, LiveFeed feed, LiveFaultDesk desk) {
        this.counters = counters;
        this.lateness = lateness;
        this.feed = feed;
        this.desk = desk;
    }

    @Override
    public String get() {
        PrometheusText page = new PrometheusText();
        page.counter("loopstand_plant_messages_sent_total", "messages the plant handed to its link or fault stage, by kind");
        counters.sentByKind().forEach((kind, n) -> page.sample(n, "kind", kind));
        page.counter("loopstand_plant_messages_not_sent_total",
                "messages the plant could not send (link down or cut), by kind and reason");
        counters.notSentByKindAndReason().forEach((k, n) -> page.sample(n, labels("kind", "reason", k)));
        page.counter("loopstand_plant_messages_fault_lost_total",
                "messages a fault kept off the wire (dropped, link down, queue full), by kind and fate");
        counters.faultLostByKindAndFate().forEach((k, n) -> page.sample(n, labels("kind", "fate", k)));
        page.counter("loopstand_plant_commands_total", "commands the unit interfaces decided, by kind and outcome");
        counters.commandsByKindAndOutcome().forEach((k, n) -> page.sample(n, labels("kind", "outcome", k)));
        page.counter("loopstand_plant_command_refusals_total", "commands refused, by reason");
        counters.refusalsByReason().forEach((reason, n) -> page.sample(n, "reason", reason));
        page.summaryOfMicros("loopstand_plant_step_lateness_seconds", "how late physics steps ran against the clock, s",
                lateness.histogramUs());
        LiveSnapshot s = feed.latest();
        page.gauge("loopstand_plant_scenario_time_seconds", "scenario time, s").sample(s == null ? 0 : s.timeS());
        page.gauge("loopstand_plant_rate_ratio", "scenario seconds per wall second").sample(s == null ? Double.NaN : s.rate());
        page.gauge("loopstand_plant_faults_active", "faults active now").sample(s == null ? 0 : s.faults().size());
        if (desk != null) {
            page.counter("loopstand_plant_live_fault_actions_total", "fault starts and stops from the live view, by result");
            desk.actionCounts().forEach((k, n) -> page.sample(n, labels("action", "result", k.replace('|', '\u0000'))));
        }
        JvmFigures.writeTo(page);
        return page.text();
    }

    private static String[] labels(String first, String second, String key) {
        int cut = key.indexOf(PlantCounters.SEP);
        return new String[] {first, key.substring(0, cut), second, key.substring(cut + 1)};
    }

}
