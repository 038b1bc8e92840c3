package org.loopstand.plant.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;

import org.loopstand.plant.live.LiveView;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Option;

/** The {@code plant} options of the live view (docs/live-view.md). */
public final class LiveMixin {
    @Option(names = "--live-port", paramLabel = "PORT", description = "serve the live view (page, live charts, fault"
            + " controls, /metrics) on this port, 0 = any free port; the address is printed as 'live view: URL' (default: no live view)")
    Integer livePort;

    @Option(names = "--live-bind", defaultValue = "127.0.0.1", description = "address of the live view (default ${DEFAULT-VALUE});"
            + " off loopback only with --live-token-file")
    String liveBind;

    @Option(names = "--live-token-file", paramLabel = "FILE", description = "first line = token (≥ 16 characters) every"
            + " live view request must carry; required off loopback")
    Path liveTokenFile;

    @Option(names = "--test-broker", description = "declare the --broker a test broker: the live view then offers fault"
            + " controls (on the embedded broker it always does)")
    boolean testBroker;

    /**
     * Starts the live view when {@code --live-port} was given (before {@code runner.start()}).
     *
     * @param embeddedBroker true when the run is on the plant's embedded broker (fault controls offered)
     * @param report         where the run's report will be, or null
     * @return the live view, or null when not asked for
     * @throws IllegalArgumentException naming a wrong option
     * @throws IOException              when the port cannot be listened on
     */
    LiveView startIfAsked(PlantRunner runner, FaultHooks hooks, Clock clock, boolean embeddedBroker, List<String> checkNames,
                          Path report) throws IOException {
        if (livePort == null) {
            return null;
        }
        return LiveView.start(new LiveView.Settings(liveBind, livePort, liveTokenFile, embeddedBroker || testBroker),
                runner, hooks, clock, WallClock.INSTANCE, checkNames, report);
    }
}
