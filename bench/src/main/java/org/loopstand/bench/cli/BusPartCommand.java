package org.loopstand.bench.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.loopstand.bench.run.BusPart;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code bench bus-part}: the plant, controller or unit host process that {@code bench bus --layout processes|hosts} starts. */
@Command(name = "bus-part", hidden = true, mixinStandardHelpOptions = true,
        description = "One half of a bench run in its own process (started by bench bus --layout processes).")
public final class BusPartCommand implements Callable<Integer> {
    @Option(names = "--role", required = true, description = "plant, controller or units")
    String role;

    @Option(names = "--settings", required = true, description = "the bench's settings file")
    Path settings;

    @Option(names = "--site-id", required = true, description = "the generated site's id")
    String siteId;

    @Option(names = "--broker-uri", required = true, description = "tcp:// URL of the broker")
    String brokerUri;

    @Option(names = "--unit-share", defaultValue = "0/1", description = "K/N: with --role units, serve the units whose"
            + " index modulo N is K (default ${DEFAULT-VALUE})")
    String unitShare;

    @Override
    public Integer call() throws Exception {
        String[] kn = unitShare.split("/");
        int k;
        int n;
        try {
            k = Integer.parseInt(kn[0]);
            n = Integer.parseInt(kn[1]);
        } catch (RuntimeException e) {
            System.err.println("bench: --unit-share must be K/N, got " + unitShare);
            return 2;
        }
        if (n < 1 || k < 0 || k >= n) {
            System.err.println("bench: --unit-share K/N needs 0 ≤ K < N, got " + unitShare);
            return 2;
        }
        return new BusPart(settings, siteId, brokerUri, line -> {
            System.out.println(line);
            System.out.flush();
        }).unitShare(k, n).run(role, System.in);
    }
}
