package org.loopstand.report.html;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;
import org.loopstand.report.model.TimeSeries;

class HtmlReportWriterTest {
    @TempDir
    Path dir;

    @Test
    void shouldWriteOneFileWithNoExternalReference() throws Exception {
        Path file = HtmlReportWriter.write(SampleReport.model(false), dir.resolve("report.html"));
        String html = Files.readString(file);
        // No src/href/url() pointing anywhere but into the file itself.
        Matcher m = Pattern.compile("(?i)(src|href)\\s*=\\s*[\"']?\\s*(https?:|//)|url\\(\\s*[\"']?\\s*(https?:|//)|@import")
                .matcher(html);
        assertThat(m.find()).as("external reference at %s", m.hitEnd() ? "-" : html.substring(Math.max(0, m.start() - 40), m.end() + 40)).isFalse();
        assertThat(html).doesNotContainPattern("(?i)<link\\b").doesNotContainPattern("(?i)<script[^>]*\\ssrc=");
        // uPlot and the CSS are inlined, once each.
        assertThat(html).contains("var uPlot=function()").contains(".uplot");
        assertThat(html.split("<script>", -1)).hasSize(3);
    }

    @Test
    void shouldShowVerdictChecksCautionsAndConfiguration() {
        String html = HtmlReportWriter.render(SampleReport.model(false));
        assertThat(html).contains("id=\"verdict\">PASS<");
        assertThat(html).contains("ACE recovered after the load step").contains("≤ 900 s");
        assertThat(html).contains("not evidence of compliance").contains("raise/lower commands")
                .contains("licensed engineering practice");
        assertThat(html).contains("area.north.biasMwPer0p1Hz").contains("0.1.0-SNAPSHOT");
        assertThat(html).doesNotContain("id=\"cut-short\"");
    }

    @Test
    void shouldMarkARunCutShortWhateverItsChecksSay() {
        ReportModel model = SampleReport.model(true);
        assertThat(model.checks()).allMatch(CheckResult::passed);
        String html = HtmlReportWriter.render(model);
        assertThat(model.verdict()).isEqualTo(ReportModel.Verdict.CUT_SHORT);
        assertThat(html).contains("id=\"verdict\">CUT SHORT<").contains("id=\"cut-short\"")
                .contains("controller.jsonl has no end entry.");
    }

    @Test
    void shouldFailWhenAnyCheckFailsAndEscapeText() {
        RunInfo run = new RunInfo("r<1>", "s&t", "sc", 0, 10_000, false, "");
        TimeSeries s = new TimeSeries("x</script>", "MW", new long[] {0, 5000, 10_000}, new double[] {1, Double.NaN, 3});
        ReportModel model = new ReportModel(run, List.of(new CheckResult("a", true, "1", "2", ""),
                new CheckResult("b <b>", false, "3", "4", "")), List.of(), List.of(new Chart("c", "MW", List.of(s), false)),
                List.of(), Map.of(), Map.of(), List.of());
        String html = HtmlReportWriter.render(model);
        assertThat(model.verdict()).isEqualTo(ReportModel.Verdict.FAIL);
        assertThat(html).contains("id=\"verdict\">FAIL<").contains("r&lt;1&gt;").contains("b &lt;b&gt;")
                .doesNotContain("x</script>");
    }

    @Test
    void shouldCarryChartDataAsInlineJsonOnTheSharedTimeAxis() throws Exception {
        RunInfo run = new RunInfo("r", "s", "sc", 1_000_000, 1_010_000, false, "");
        TimeSeries a = new TimeSeries("a", "MW", new long[] {1_000_000, 1_004_000}, new double[] {1, 2});
        TimeSeries b = new TimeSeries("b", "MW", new long[] {1_002_000, 1_004_000}, new double[] {Double.NaN, 5});
        String html = HtmlReportWriter.render(new ReportModel(run, List.of(), List.of(),
                List.of(new Chart("c", "MW", List.of(a, b), false)), List.of(), Map.of(), Map.of(), List.of()));
        String json = html.substring(html.indexOf("id=\"report-data\">") + 17, html.indexOf("</script>"));
        JsonNode data = new ObjectMapper().readTree(json);
        assertThat(data.get("durationS").asDouble()).isEqualTo(10.0);
        // union of times 0, 2, 4 s since start; a has no sample at 2 s, b none at 0 s and NaN at 2 s → null
        assertThat(data.at("/charts/0/data/0").toString()).isEqualTo("[0.0,2.0,4.0]");
        assertThat(data.at("/charts/0/data/1").toString()).isEqualTo("[1.0,null,2.0]");
        assertThat(data.at("/charts/0/data/2").toString()).isEqualTo("[null,null,5.0]");
        assertThat(ReportModel.Verdict.NO_CHECKS.label()).isEqualTo("NO CHECKS");
    }

    @Test
    void shouldThinLongSeriesButKeepTheirExtremes() {
        int n = 100_000;
        long[] t = new long[n];
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = i * 20L;
            v[i] = Math.sin(i / 100.0);
        }
        v[54_321] = -7.5; // a spike
        TimeSeries thin = ChartData.thin(new TimeSeries("f", "Hz", t, v), ChartData.MAX_POINTS_PER_SERIES);
        assertThat(thin.size()).isLessThanOrEqualTo(ChartData.MAX_POINTS_PER_SERIES);
        assertThat(thin.values()).contains(-7.5);
        assertThat(thin.timeMs(0)).isZero();
        assertThat(thin.timeMs(thin.size() - 1)).isEqualTo((n - 1) * 20L);
    }
}
