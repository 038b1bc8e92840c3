package org.loopstand.app.cli;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;

import org.loopstand.plant.cli.PlantCli;
import org.loopstand.report.html.HtmlReportWriter;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.run.RunFolder;
import org.loopstand.report.run.RunReportBuilder;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code loopstand report RUN}: writes RUN/report.html from the run folder's journals. */
@Command(name = "report", mixinStandardHelpOptions = true,
        description = "Write the self-contained HTML report of a run folder (RUN/report.html).")
public final class ReportCommand implements Callable<Integer> {
    @Parameters(paramLabel = "RUN", description = "run folder, e.g. runs/20260101-120000-unit-trip")
    Path run;

    @Option(names = "--epsilon1-hz", description = "ε1 for CPS1 and BAAL, Hz (default ${DEFAULT-VALUE}: Eastern Interconnection;"
            + " a configured assumption for 50 Hz areas)", defaultValue = "0.018")
    double epsilon1Hz;

    @Option(names = "--out", description = "report file (default RUN/report.html)")
    Path out;

    @Override
    public Integer call() {
        if (!Files.isDirectory(run)) {
            System.err.println("report: " + run + " is not a run folder");
            return 2;
        }
        try {
            RunFolder folder = RunFolder.read(run);
            ReportModel model = RunReportBuilder.build(folder, Map.of(), List.of(), PlantCli.VERSION, epsilon1Hz);
            Path file = HtmlReportWriter.write(model, out != null ? out : run.resolve("report.html"));
            folder.problems().forEach(p -> System.out.println("report: note: " + p));
            System.out.println("report: " + model.verdict().label() + ", " + model.checks().size() + " check(s)");
            System.out.println("report: " + file.toAbsolutePath());
            return 0;
        } catch (RuntimeException e) {
            System.err.println("report: " + e.getMessage());
            return 1;
        }
    }
}
