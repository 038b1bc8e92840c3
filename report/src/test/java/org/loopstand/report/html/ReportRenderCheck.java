package org.loopstand.report.html;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Renders a sample report in headless Chromium, offline, when Chromium is installed (skipped otherwise):
 * the screenshot must be non-trivial and the DOM after scripts must hold the uPlot charts.
 */
class ReportRenderCheck {
    private static final Path CHROMIUM = Path.of("/usr/bin/chromium");

    @TempDir
    Path dir;

    @Test
    void shouldRenderTheReportWithItsChartsInHeadlessChromium() throws Exception {
        Assumptions.assumeTrue(Files.isExecutable(CHROMIUM), "chromium not installed");
        Path html = HtmlReportWriter.write(SampleReport.model(true), dir.resolve("report.html"));
        Path png = dir.resolve("report.png");
        run(List.of("--screenshot=" + png, "--window-size=1280,2000", html.toUri().toString()), dir.resolve("shot.log"));
        assertThat(png).exists();
        assertThat(Files.size(png)).isGreaterThan(50_000L);

        Path dom = dir.resolve("dom.html");
        run(List.of("--dump-dom", "--virtual-time-budget=5000", html.toUri().toString()), dom);
        String after = Files.readString(dom, StandardCharsets.UTF_8);
        // report.js marks how many plots it drew: 6 time charts + 1 histogram in the sample.
        assertThat(after).contains("data-charts=\"7\"");
        assertThat(after.split("class=\"uplot", -1).length - 1).isEqualTo(7);
        // Keep a copy for a person to look at.
        Path keep = Path.of("target", "sample-report");
        Files.createDirectories(keep);
        Files.copy(png, keep.resolve("report.png"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        Files.copy(html, keep.resolve("report.html"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }

    private void run(List<String> extra, Path stdout) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(CHROMIUM.toString(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--hide-scrollbars", "--user-data-dir=" + dir.resolve("profile")));
        cmd.addAll(extra);
        Process p = new ProcessBuilder(cmd).redirectOutput(stdout.toFile())
                .redirectError(dir.resolve("chromium.err").toFile()).start();
        if (!p.waitFor(90, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("chromium did not finish within 90 s");
        }
    }
}
