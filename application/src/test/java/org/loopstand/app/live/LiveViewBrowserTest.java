package org.loopstand.app.live;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.fail;

import java.io.ByteArrayOutputStream;

import java.io.PrintStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.awaitility.Awaitility;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.app.rehearsal.Rehearsal;
import org.loopstand.app.rehearsal.RehearsalSettings;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.time.WallClock;
import org.openqa.selenium.By;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.OutputType;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.chrome.ChromeDriver;
import org.openqa.selenium.chrome.ChromeDriverService;
import org.openqa.selenium.chrome.ChromeOptions;

/**
 * The live view in real headless Chromium (Debian's chromium and chromedriver) on a running
 * rehearsal: scenario time advances, a chart gains points, a fault started from the page reaches the
 * plant journal with who started it, and the report link appears at the end. Screenshots at 1400×900
 * and on a narrow window go to target/live-view/. Without Chromium the test fails under CI=true and
 * is skipped loudly otherwise.
 */
class LiveViewBrowserTest {
    static final Path SCENARIO = Path.of("src", "test", "resources", "rehearsal", "short-trip.yaml");
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final Path CHROMIUM = Path.of("/usr/bin/chromium");
    static final Path CHROMEDRIVER = Path.of("/usr/bin/chromedriver");
    static final Path ARTIFACTS = Path.of("target", "live-view");
    static final Pattern ADDRESS = Pattern.compile("live view: (http://127\\.0\\.0\\.1:\\d+/)");

    @TempDir
    Path runs;

    final ByteArrayOutputStream output = new ByteArrayOutputStream();

    @Test
    void shouldShowTheRunLiveAndStartAndStopAFaultFromThePage() throws Exception {
        requireChromium();
        String cp = System.getProperty("java.class.path");
        RehearsalSettings s = new RehearsalSettings(SCENARIO, SITE, null, 3, runs,
                Path.of(System.getProperty("java.home"), "bin", "java").toString(), cp, cp, freePort(), 60_000,
                List.of("--live-port", "0"), Path.of(".."));
        Rehearsal rehearsal = new Rehearsal(s, WallClock.INSTANCE, new PrintStream(output, true, StandardCharsets.UTF_8), false);
        CompletableFuture<Rehearsal.Outcome> outcome = CompletableFuture.supplyAsync(rehearsal::run);
        WebDriver browser = null;
        try {
            Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> ADDRESS.matcher(out()).find() || outcome.isDone());
            Matcher m = ADDRESS.matcher(out());
            assertThat(m.find()).as(out()).isTrue();
            browser = chromium();
            browser.manage().window().setSize(new Dimension(1400, 900));
            browser.get(m.group(1));
            WebDriver b = browser;

            // scenario time advances and the frequency chart gains points, pushed without reloads
            Awaitility.await().atMost(Duration.ofSeconds(60)).until(() -> scenarioTimeS(b) > 0);
            double firstS = scenarioTimeS(b);
            int firstPoints = points(b);
            Awaitility.await().atMost(Duration.ofSeconds(30)).until(() -> scenarioTimeS(b) > firstS + 2 && points(b) > firstPoints);
            assertThat(b.findElements(By.cssSelector("#chart-frequency canvas"))).isNotEmpty();

            // a fault from the page: same words as the CLI for a bad parameter, then a good one
            startFault(b, "drop", "north-basin", "dropProbability=2", "page-bad");
            Awaitility.await().atMost(Duration.ofSeconds(10)).until(() -> answer(b), a -> a.startsWith("refused:"));
            assertThat(answer(b)).isEqualTo(cliRefusal("start", "--type", "drop", "--target", "north-basin",
                    "--param", "dropProbability=2", "--order", "page-bad"));
            startFault(b, "drop", "north-basin", "dropProbability=0.5", "page-1");
            Awaitility.await().atMost(Duration.ofSeconds(10)).until(() -> answer(b), a -> a.startsWith("started"));
            assertThat(answer(b)).isEqualTo("started fault order page-1 (drop on [north-basin])");
            Awaitility.await().atMost(Duration.ofSeconds(10))
                    .until(() -> b.findElement(By.id("faults-table")).getText().contains("page-1"));
            b.findElement(By.id("fault-stop-order")).sendKeys("page-1");
            b.findElement(By.id("fault-stop")).click();
            Awaitility.await().atMost(Duration.ofSeconds(10)).until(() -> answer(b), a -> a.startsWith("stopped"));
            screenshot(b, "live-1400x900.png");

            b.manage().window().setSize(new Dimension(420, 900));
            screenshot(b, "live-narrow-420x900.png");

            // the report link at the end
            Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> b.findElement(By.id("report-link")).isDisplayed());
            b.manage().window().setSize(new Dimension(1400, 900));
            screenshot(b, "live-finished-1400x900.png");
            assertThat(b.findElement(By.id("report-link")).getAttribute("href")).endsWith("/report.html");
        } finally {
            if (browser != null) {
                browser.quit();
            }
            rehearsal.abort(); // ends the live view's hold after the report
        }
        Rehearsal.Outcome o = outcome.get();
        // the run completed (no process failed): its exit code follows the verdict, 1 for this short scenario's
        // FAIL at rate 3, or 130 when the abort above ended the live view's hold
        assertThat(o.message() == null || o.exitCode() == 130).as(out()).isTrue();
        assertThat(o.exitCode()).as(out()).isIn(0, 1, 130);
        List<JournalEntry> plant = JournalReader.readAll(o.runFolder().resolve("plant.jsonl")).entries();
        assertThat(plant).anyMatch(e -> e.kind().equals("fault") && "start".equals(e.text("action"))
                && "page-1".equals(e.text("faultId")) && "order".equals(e.text("source")));
        assertThat(plant).anyMatch(e -> e.kind().equals("fault") && "stop".equals(e.text("action"))
                && "page-1".equals(e.text("faultId")));
        assertThat(plant).filteredOn(e -> e.kind().equals("event") && "liveFaultAction".equals(e.text("event")))
                .anySatisfy(e -> {
                    assertThat(e.text("orderId")).isEqualTo("page-1");
                    assertThat(e.text("by")).isEqualTo("browser-test");
                    assertThat(e.text("from")).isEqualTo("127.0.0.1");
                    assertThat(e.text("result")).isEqualTo("applied");
                })
                .anySatisfy(e -> assertThat(e.text("detail")).startsWith("refused: dropProbability"));
        assertThat(out()).contains("live view: http://127.0.0.1:");
    }

    private static void startFault(WebDriver b, String type, String targets, String params, String orderId) {
        WebElement select = b.findElement(By.id("fault-type"));
        select.findElement(By.cssSelector("option[value='" + type + "']")).click();
        for (String id : List.of("fault-targets", "fault-params", "fault-order", "fault-name")) {
            b.findElement(By.id(id)).clear();
        }
        b.findElement(By.id("fault-targets")).sendKeys(targets);
        b.findElement(By.id("fault-params")).sendKeys(params);
        b.findElement(By.id("fault-order")).sendKeys(orderId);
        b.findElement(By.id("fault-name")).sendKeys("browser-test");
        ((org.openqa.selenium.JavascriptExecutor) b).executeScript("document.getElementById('fault-answer').textContent = ''");
        b.findElement(By.id("fault-start")).click();
    }

    /** What {@code loopstand fault} prints for the same order (it refuses before reaching any broker). */
    static String cliRefusal(String... args) {
        PrintStream err = System.err;
        ByteArrayOutputStream captured = new ByteArrayOutputStream();
        try {
            System.setErr(new PrintStream(captured, true, StandardCharsets.UTF_8));
            int code = new picocli.CommandLine(new org.loopstand.plant.cli.FaultCommand()).execute(args);
            assertThat(code).isEqualTo(2);
        } finally {
            System.setErr(err);
        }
        return captured.toString(StandardCharsets.UTF_8).strip();
    }

    private static String answer(WebDriver b) {
        return b.findElement(By.id("fault-answer")).getText();
    }

    private static double scenarioTimeS(WebDriver b) {
        String t = b.findElement(By.id("scenario-time")).getText();
        try {
            return Double.parseDouble(t);
        } catch (NumberFormatException e) {
            return -1;
        }
    }

    private static int points(WebDriver b) {
        String p = b.findElement(By.tagName("body")).getAttribute("data-points");
        return p == null ? 0 : Integer.parseInt(p);
    }

    private static void screenshot(WebDriver b, String name) throws Exception {
        Files.createDirectories(ARTIFACTS);
        ((org.openqa.selenium.JavascriptExecutor) b).executeScript("window.scrollTo(0, 0)");
        byte[] png = ((org.openqa.selenium.TakesScreenshot) b).getScreenshotAs(OutputType.BYTES);
        Files.write(ARTIFACTS.resolve(name), png);
    }

    private WebDriver chromium() throws Exception {
        Path profile = Files.createTempDirectory(runs, "chromium-profile");
        ChromeOptions o = new ChromeOptions();
        o.setBinary(CHROMIUM.toFile());
        o.addArguments("--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--disable-dev-shm-usage", "--user-data-dir=" + profile, "--window-size=1400,900");
        ChromeDriverService service = new ChromeDriverService.Builder().usingDriverExecutable(CHROMEDRIVER.toFile())
                .usingAnyFreePort().build();
        return new ChromeDriver(service, o);
    }

    /** Fails under CI (Chromium is part of the test bed there); skips loudly on a developer's machine. */
    static void requireChromium() {
        boolean present = Files.isExecutable(CHROMIUM) && Files.isExecutable(CHROMEDRIVER);
        if (present) {
            return;
        }
        String why = "the live view's browser test needs Debian's chromium and chromedriver (" + CHROMIUM + ", "
                + CHROMEDRIVER + "): apt-get install -y chromium chromium-driver";
        if ("true".equalsIgnoreCase(System.getenv("CI"))) {
            fail(why);
        }
        System.err.println("*** SKIPPED: " + why + " ***");
        Assumptions.abort(why);
    }

    static int freePort() throws Exception {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            return s.getLocalPort();
        }
    }

    String out() {
        return output.toString(StandardCharsets.UTF_8);
    }

}
