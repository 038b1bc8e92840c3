package org.loopstand.plant.cli;

import java.time.Duration;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.protocol.security.AuthPolicy;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code loopstand broker}: runs the embedded MQTT 5 broker until Ctrl-C. */
@Command(name = "broker", mixinStandardHelpOptions = true,
        description = "Run the embedded MQTT 5 broker (HiveMQ CE) until Ctrl-C.")
public final class BrokerCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = {"--broker-port", "--port"}, defaultValue = "1884", description = "TCP port, 0 = any free port (default ${DEFAULT-VALUE})")
    int port;

    @Option(names = "--bind", defaultValue = "127.0.0.1", description = "loopback address to listen on (default ${DEFAULT-VALUE}); any other is refused: no auth")
    String bindAddress;

    @Override
    public Integer call() throws InterruptedException {
        org.loopstand.protocol.cli.OldSpellings.of("--port", "--broker-port")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        if (!AuthPolicy.isLoopback(bindAddress)) {
            // this command starts the broker without authentication or TLS: never on a network
            System.err.println("broker: refusing --bind " + bindAddress + ": this broker runs without authentication"
                    + " or TLS, so it listens on loopback only (127.0.0.1, ::1); for a networked broker use"
                    + " 'plant --credentials-file' or Mosquitto with config/broker/mosquitto-secure.conf");
            return 2;
        }
        CountDownLatch stopped = new CountDownLatch(1);
        EmbeddedBroker broker = new EmbeddedBroker(bindAddress, port);
        try {
            broker.start(Duration.ofSeconds(75));
        } catch (IllegalStateException e) {
            System.err.println("broker: " + e.getMessage());
            return 1;
        }
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            broker.close();
            stopped.countDown();
        }, "broker-shutdown"));
        System.out.println("broker listening on " + broker.serverUri());
        System.out.flush();
        stopped.await();
        return 0;
    }
}
