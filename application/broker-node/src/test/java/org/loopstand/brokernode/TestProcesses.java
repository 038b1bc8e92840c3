package org.loopstand.brokernode;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * The child processes of one test: started with their output in the test's folder, all stopped at the
 * end, and their output (and any run journals) kept under {@code target/} for a look after a failure.
 */
final class TestProcesses {
    private final Path dir;
    private final List<Process> processes = new ArrayList<>();

    /** @param dir the test's own folder; NAME.out and NAME.err go there */
    TestProcesses(Path dir) {
        this.dir = dir;
    }

    Process launch(List<String> command, String name) throws IOException {
        Process p = new ProcessBuilder(command).redirectOutput(dir.resolve(name + ".out").toFile())
                .redirectError(dir.resolve(name + ".err").toFile()).start();
        processes.add(p);
        return p;
    }

    /** Kills every process still running (SIGKILL) and waits for it. */
    void killAll() throws InterruptedException {
        for (Process p : processes) {
            p.destroyForcibly().waitFor(10, TimeUnit.SECONDS);
        }
    }

    /**
     * Copies every .out and .err, and the given files of the test's folder, to {@code target/<keepDir>}.
     *
     * @param more paths relative to the test's folder, copied when they exist
     */
    void keepOutput(String keepDir, String... more) throws IOException {
        Path keep = Files.createDirectories(Path.of("target", keepDir));
        List<Path> files = new ArrayList<>();
        try (var list = Files.list(dir)) {
            list.filter(f -> f.toString().endsWith(".out") || f.toString().endsWith(".err")).forEach(files::add);
        }
        for (String m : more) {
            files.add(dir.resolve(m));
        }
        for (Path f : files) {
            if (Files.exists(f)) {
                Files.copy(f, keep.resolve(f.getFileName()), StandardCopyOption.REPLACE_EXISTING);
            }
        }
    }

    /** @return a copy of the site file in the test's folder whose controller asks for pulses only */
    Path pulsesOnlySite(Path site) throws IOException {
        Path copy = dir.resolve("site-pulses-only.yaml");
        String text = Files.readString(site);
        String pulsesOnly = "  pulses: {preferSetpoints: false}\n";
        Files.writeString(copy, text.contains("\ncontroller:\n")
                ? text.replace("\ncontroller:\n", "\ncontroller:\n" + pulsesOnly)
                : text + "\ncontroller:\n" + pulsesOnly);
        return copy;
    }
}
