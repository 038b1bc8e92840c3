package org.loopstand.app.cli;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

import org.loopstand.report.csv.CsvExporter;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code loopstand export RUN --csv}: one CSV per journal (and per kind with --kind) for spreadsheets. */
@Command(name = "export", mixinStandardHelpOptions = true,
        description = "Export a run folder's journals as CSV (RFC 4180) for spreadsheet users.")
public final class ExportCommand implements Callable<Integer> {
    @Parameters(paramLabel = "RUN", description = "run folder")
    Path run;

    @Option(names = "--csv", required = true, description = "write CSV (the only format for now)")
    boolean csv;

    @Option(names = "--kind", description = "only entries of this kind (truth, published, command, decided, sent, ...)")
    String kind;

    @Override
    public Integer call() throws IOException {
        if (!Files.isDirectory(run)) {
            System.err.println("export: " + run + " is not a run folder");
            return 2;
        }
        List<Path> journals;
        try (Stream<Path> s = Files.list(run)) {
            journals = s.filter(p -> p.getFileName().toString().endsWith(".jsonl")).sorted().toList();
        }
        if (journals.isEmpty()) {
            System.err.println("export: " + run + " holds no *.jsonl journal");
            return 2;
        }
        for (Path j : journals) {
            String base = j.getFileName().toString().replaceFirst("\\.jsonl$", "");
            Path out = run.resolve(base + (kind == null ? "" : "-" + kind) + ".csv");
            try {
                CsvExporter.Export e = CsvExporter.export(j, kind, out);
                System.out.println("export: " + out + " (" + e.rows() + " rows, " + e.columns().size() + " columns"
                        + (e.journal().cutShort() ? "; journal cut short: " + e.journal().describe() : "") + ")");
            } catch (RuntimeException e) {
                System.err.println("export: " + j + ": " + e.getMessage());
                return 1;
            }
        }
        return 0;
    }
}
