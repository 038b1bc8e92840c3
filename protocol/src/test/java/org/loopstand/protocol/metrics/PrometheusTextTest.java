package org.loopstand.protocol.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Map;

import org.junit.jupiter.api.Test;

class PrometheusTextTest {
    @Test
    void shouldWriteFamiliesThatAStrictReaderParsesBack() {
        PrometheusText page = new PrometheusText();
        page.counter("demo_messages_total", "messages\nby kind").sample(3, "kind", "AreaMeter").sample(0.5, "kind", "a\"b\\c\nd");
        page.gauge("demo_rate_ratio", "rate").sample(Double.NaN).sample(Double.POSITIVE_INFINITY, "x", "up");
        page.summary("demo_lateness_seconds", "lateness").sample(0.004, "quantile", "0.99").sample("_sum", 1.25).sample("_count", 7);
        JvmFigures.writeTo(page);
        PrometheusPage p = PrometheusPage.parse(page.text());
        assertThat(p.types).containsEntry("demo_messages_total", "counter").containsEntry("demo_lateness_seconds", "summary")
                .containsEntry("jvm_memory_used_bytes", "gauge");
        assertThat(p.value("demo_messages_total", "kind", "AreaMeter")).isEqualTo(3);
        assertThat(p.value("demo_messages_total", "kind", "a\"b\\c\nd")).isEqualTo(0.5);
        assertThat(p.value("demo_rate_ratio")).isNaN();
        assertThat(p.value("demo_rate_ratio", "x", "up")).isInfinite();
        assertThat(p.value("demo_lateness_seconds_count")).isEqualTo(7);
        assertThat(p.samples("demo_messages_total")).extracting(PrometheusPage.Sample::labels)
                .contains(Map.of("kind", "AreaMeter"));
        // the format's own example line shapes (prometheus.io, "Exposition formats"; from memory)
        assertThat(page.text()).contains("# TYPE demo_messages_total counter\n")
                .contains("demo_messages_total{kind=\"AreaMeter\"} 3\n")
                .contains("demo_messages_total{kind=\"a\\\"b\\\\c\\nd\"} 0.5\n")
                .contains("# HELP demo_messages_total messages\\nby kind\n")
                .contains("demo_rate_ratio NaN\n").contains("demo_rate_ratio{x=\"up\"} +Inf\n");
    }

    @Test
    void shouldRefuseBadNamesRepeatedFamiliesAndOddLabels() {
        PrometheusText page = new PrometheusText();
        assertThatThrownBy(() -> page.counter("9bad", "x")).hasMessageContaining("'9bad' is not a valid Prometheus name");
        page.counter("ok_total", "x");
        assertThatThrownBy(() -> page.gauge("ok_total", "y")).hasMessageContaining("'ok_total' is written twice");
        assertThatThrownBy(() -> page.sample(1, "kind")).hasMessageContaining("name/value pairs");
        assertThatThrownBy(() -> page.sample(1, "bad-label", "v")).hasMessageContaining("label name 'bad-label'");
        assertThatThrownBy(() -> new PrometheusText().sample(1)).hasMessageContaining("needs a family first");
        assertThatThrownBy(() -> PrometheusPage.parse("x_total 1\n")).hasMessageContaining("before its TYPE");
    }
}
