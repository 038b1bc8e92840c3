package org.loopstand.controller.pulsetest;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class PulseTestRunFolderTest {
    @Test
    void shouldWriteResultJsonCsvAndAReportWithCautionsAndVerdict(@TempDir Path tmp) throws Exception {
        Rig rig = new Rig("quick.yaml", 12, 30, 4000);
        rig.unit.fault = ModelUnit.Fault.SWAPPED;
        PulseTestResult r = rig.run();
        Path dir = tmp.resolve(PulseTestRunFolder.runId(r.record().startedMs(), "unit-a"));
        Path html = PulseTestRunFolder.write(dir, r, rig.plan, "rig-site", Map.of("broker", "mem:"));

        JsonNode json = new ObjectMapper().readTree(dir.resolve("result.json").toFile());
        assertThat(json.get("verdict").asText()).isEqualTo("fail");
        assertThat(json.get("findings").get(0).asText()).contains("opposite");
        assertThat(json.get("steps").size()).isEqualTo(r.steps().size());
        assertThat(json.get("steps").get(1).get("measured").get("gainMwPerPulseS").asDouble()).isNegative();
        assertThat(Files.readAllLines(dir.resolve("telemetry.csv"))).hasSize(r.record().telemetry().size() + 1);
        String page = Files.readString(html);
        assertThat(page).contains("id=\"verdict\">FAIL").contains("control room and the grid operator")
                .contains("staircase raise 1/1: gain").contains("Requested vs measured output unit-a");
        // per-step figures under their own heading, not under the rehearsal's frequency quality
        assertThat(page).contains("<section id=\"unit-response\">\n<h2>Unit response</h2>")
                .contains("Step 2: staircase raise 1/1").doesNotContain("id=\"frequency-quality\"");
        // the report's own title and headings, not a rehearsal's
        assertThat(page).contains("<h1>Loopstand unit response test</h1>").contains("<h2>Unit response test results</h2>")
                .doesNotContain("rehearsal report").doesNotContain("Scenario checks");
        assertThat(dir.getFileName().toString()).isEqualTo("20260101T000000-pulse-test-unit-a");
    }
}
