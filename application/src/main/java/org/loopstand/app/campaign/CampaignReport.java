package org.loopstand.app.campaign;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.loopstand.plant.check.CheckOutcome;

/**
 * Writes a campaign folder's summaries: {@code campaign.json} (everything: settings, pass rates, the
 * tables by fault kind and parameter range, every run with its seed, checks and reproduce command, the
 * shrunk combinations, errors with stack traces), {@code runs.csv} (one row per run) and
 * {@code report.html} ({@link CampaignHtml}).
 */
public final class CampaignReport {
    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private CampaignReport() {
    }

    /** Writes the three files into the result's folder. */
    public static void write(CampaignRunner.Result result) {
        CampaignStats stats = new CampaignStats(result.runs());
        Path folder = result.folder();
        try {
            JSON.writeValue(folder.resolve("campaign.json").toFile(), json(result, stats));
            Files.writeString(folder.resolve("runs.csv"), csv(result), StandardCharsets.UTF_8);
            Files.writeString(folder.resolve("report.html"), CampaignHtml.page(result, stats), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the campaign report in " + folder + ": " + e.getMessage(), e);
        }
    }

    /** @return the command that reruns {@code run} alone */
    public static String reproduce(CampaignRunner.Result result, RunResult run) {
        return Reproduce.command(run.scenarioFile(), result.spec().siteFile(), run.plan().seed());
    }

    /** @return the command that reruns a shrunk combination alone */
    public static String reproduce(CampaignRunner.Result result, RunResult.Shrunk s) {
        return Reproduce.command(s.scenarioFile(), result.spec().siteFile(), s.smallest().seed());
    }

    private static Map<String, Object> json(CampaignRunner.Result r, CampaignStats stats) {
        CampaignSpec spec = r.spec();
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("campaign", spec.name());
        m.put("campaignFile", spec.file().toString());
        m.put("siteFile", spec.siteFile().toString());
        m.put("baseScenario", spec.scenarioFile().toString());
        m.put("masterSeed", spec.masterSeed());
        m.put("runs", r.runs().size());
        m.put("workers", r.workers());
        m.put("wallMs", r.wallMs());
        m.put("shrinkWallMs", r.shrinkWallMs());
        m.put("passed", r.count(RunResult.Status.PASS));
        m.put("failed", r.count(RunResult.Status.FAIL));
        m.put("errors", r.count(RunResult.Status.ERROR));
        m.put("checks", stats.checkRates());
        m.put("byFaultKind", stats.kinds());
        m.put("byParameterRange", stats.ranges());
        List<Map<String, Object>> shrunk = new ArrayList<>();
        for (RunResult.Shrunk s : r.shrunk()) {
            Map<String, Object> x = new LinkedHashMap<>();
            x.put("run", s.runIndex());
            x.put("check", s.check());
            x.put("seed", s.smallest().seed());
            x.put("combination", s.smallest().describe());
            x.put("runsTried", s.runsTried());
            x.put("steps", s.steps());
            x.put("outcome", s.outcome().toString());
            x.put("scenarioFile", s.scenarioFile().toString());
            x.put("reproduce", reproduce(r, s));
            shrunk.add(x);
        }
        m.put("shrunk", shrunk);
        List<Map<String, Object>> runs = new ArrayList<>();
        for (RunResult run : r.runs()) {
            Map<String, Object> x = new LinkedHashMap<>();
            x.put("run", run.plan().index());
            x.put("seed", run.plan().seed());
            x.put("status", run.status().name());
            x.put("drawn", run.plan().describe());
            x.put("failingChecks", run.failingChecks());
            x.put("checks", run.checks().stream().map(CheckOutcome::toString).toList());
            x.put("scenarioFile", run.scenarioFile().toString());
            x.put("reproduce", reproduce(r, run));
            if (run.error() != null) {
                x.put("error", run.error());
            }
            runs.add(x);
        }
        m.put("runResults", runs);
        return m;
    }

    private static String csv(CampaignRunner.Result r) {
        StringBuilder sb = new StringBuilder("run,seed,status,failingChecks,drawn,scenarioFile\n");
        for (RunResult run : r.runs()) {
            sb.append(run.plan().index()).append(',').append(run.plan().seed()).append(',').append(run.status()).append(',')
                    .append(cell(String.join(" ", run.failingChecks()))).append(',')
                    .append(cell(String.join("; ", run.plan().describe()))).append(',')
                    .append(cell(run.scenarioFile().toString())).append('\n');
        }
        return sb.toString();
    }

    private static String cell(String s) {
        return s.contains(",") || s.contains("\"") || s.contains("\n") ? "\"" + s.replace("\"", "\"\"") + "\"" : s;
    }
}
