package org.loopstand.bench.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.loopstand.bench.run.BusPart;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code bench bus-part}: the plant or controller process that {@code bench bus --layout processes} starts. */
@Command(name = "bus-part", hidden = true, mixinStandardHelpOptions = true,
        description = "One half of a bench run in its own process (started by bench bus --layout processes).")
public final class BusPartCommand implements Callable<Integer> {
    @Option(names = "--role", required = true, description = "plant or controller")
    String role;

    @Option(names = "--settings", required = true, description = "the bench's settings file")
    Path settings;

    @Option(names = "--site-id", required = true, description = "the generated site's id")
    String siteId;

    @Option(names = "--broker-uri", required = true, description = "tcp:// URL of the broker")
    String brokerUri;

    @Override
    public Integer call() throws Exception {
        return new BusPart(settings, siteId, brokerUri, line -> {
            System.out.println(line);
            System.out.flush();
        }).run(role, System.in);
    }
}
