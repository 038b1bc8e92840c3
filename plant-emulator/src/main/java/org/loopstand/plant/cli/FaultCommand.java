package org.loopstand.plant.cli;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.TimeUnit;

import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultOrderCheck;
import org.loopstand.plant.fault.FaultType;
import org.loopstand.plant.fault.ParameterSpec;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.Ids;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParentCommand;

/**
 * {@code loopstand fault start|stop|list}: live fault orders published on the faults topic of a
 * running rig, and the list of fault types with their parameters and units.
 */
@Command(name = "fault", mixinStandardHelpOptions = true,
        description = "Start or stop a fault in a running rig (publishes a fault order), or list the fault types.",
        subcommands = {FaultCommand.Start.class, FaultCommand.Stop.class, FaultCommand.ListTypes.class})
public final class FaultCommand implements Runnable {
    @Option(names = "--broker", defaultValue = "tcp://127.0.0.1:1884", description = "broker URI (default ${DEFAULT-VALUE})")
    String broker;

    @Option(names = "--site", description = "site file (YAML), as in every other command; its siteId names the rig"
            + " (a bare site id here is the old use: still taken, with a deprecation line)")
    String site;

    @Option(names = "--site-id", description = "site id of the rig, instead of --site (default demo-site when neither is given)")
    String siteId;

    /** The same auth options as every other process; under broker auth log in as {@code --username fault-tool}. */
    @Mixin
    AuthOptions auth = new AuthOptions();

    static final String CAUTION = "CAUTION: a fault order changes what a running rig does to its units and their"
            + " commands; send it only to an emulated plant on a test broker, never towards a live plant, and follow"
            + " the site's procedures.";

    @Override
    public void run() {
        System.out.println("use: fault start | fault stop | fault list (see --help)");
    }

    /** {@code fault start}. */
    @Command(name = "start", mixinStandardHelpOptions = true, description = "Start a fault now.")
    static final class Start implements Callable<Integer> {
        @ParentCommand
        FaultCommand parent;

        @Option(names = "--type", required = true, description = "fault type (see fault list)")
        String type;

        @Option(names = "--target", required = true, split = ",", description = "target id(s): area, unit or connection")
        List<String> targets;

        @Option(names = "--param", description = "parameter as name=value (repeatable), e.g. delayMs=5000")
        List<String> params = new ArrayList<>();

        @Option(names = "--duration-s", description = "how long, s (default: until stopped)")
        Double durationS;

        @Option(names = "--order", description = "order id (default: cli-<epoch ms>); give it to fault stop")
        String orderId;

        @Override
        public Integer call() throws Exception {
            long now = WallClock.INSTANCE.epochMillis();
            FaultOrderCheck.Result checked = new FaultOrderCheck(FaultLibrary.standard())
                    .start(type, targets, params, durationS, orderId != null ? orderId : "cli-" + now, now);
            if (checked.refused()) {
                System.err.println(checked.refusal());
                return 2;
            }
            FaultOrder order = checked.order();
            if (!parent.tryPublish(order)) {
                return 1;
            }
            System.out.println("sent fault order " + order.orderId() + " (" + type + " on " + targets + ") to " + parent.broker);
            return 0;
        }
    }

    /** {@code fault stop}. */
    @Command(name = "stop", mixinStandardHelpOptions = true, description = "Stop a fault started by order.")
    static final class Stop implements Callable<Integer> {
        @ParentCommand
        FaultCommand parent;

        @Option(names = "--order", required = true, description = "order id given to fault start")
        String orderId;

        @Override
        public Integer call() throws Exception {
            FaultOrderCheck.Result checked = new FaultOrderCheck(FaultLibrary.standard())
                    .stop(orderId, WallClock.INSTANCE.epochMillis());
            if (checked.refused()) {
                System.err.println(checked.refusal());
                return 2;
            }
            if (!parent.tryPublish(checked.order())) {
                return 1;
            }
            System.out.println("sent stop for fault order " + orderId + " to " + parent.broker);
            return 0;
        }
    }

    /** {@code fault list}. */
    @Command(name = "list", mixinStandardHelpOptions = true, description = "List every fault type with its parameters and units.")
    static final class ListTypes implements Callable<Integer> {
        @Option(names = "--markdown", description = "print the fault and check tables of docs/faults.md")
        boolean markdown;

        @Override
        public Integer call() {
            if (markdown) {
                System.out.print(org.loopstand.plant.scenario.ScenarioDocs.faultTable());
                System.out.println();
                System.out.print(org.loopstand.plant.scenario.ScenarioDocs.checkTable());
            } else {
                print(System.out);
            }
            return 0;
        }
    }

    /** Prints the fault library: one block per type, one line per parameter. */
    static void print(PrintStream out) {
        for (FaultType t : FaultLibrary.standard().types()) {
            out.printf(Locale.ROOT, "%s (%s; targets: %s)%n    %s%n", t.name(), t.category().name().toLowerCase(Locale.ROOT),
                    t.targetKinds().stream().sorted().map(k -> k.wireName()).toList(), t.description());
            for (ParameterSpec p : t.parameters()) {
                out.printf(Locale.ROOT, "    --param %s=…  %s, default %s: %s%n", p.name(), p.rangeText(), p.defaultText(),
                        p.description());
            }
        }
    }

    /** @return the rig's site id: {@code --site-id}, else the siteId of the {@code --site} file, else demo-site */
    String resolvedSiteId(java.util.function.Consumer<String> err) throws java.io.IOException {
        if (siteId != null) {
            return siteId;
        }
        if (site == null) {
            return "demo-site";
        }
        java.nio.file.Path file = java.nio.file.Path.of(site);
        if (java.nio.file.Files.isRegularFile(file)) {
            return org.loopstand.plant.site.SiteLoader.load(file).siteId();
        }
        err.accept("deprecated: fault --site takes the site file now; give a bare site id with --site-id (the old use"
                + " goes in release " + org.loopstand.protocol.cli.OldSpellings.REMOVED_IN + ")");
        return site;
    }

    boolean tryPublish(FaultOrder order) {
        try {
            publish(order);
            return true;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            System.err.println("interrupted before the order was sent");
            return false;
        } catch (Exception e) {
            System.err.println("fault: failed: fault order " + order.orderId() + " not sent: " + e.getMessage());
            return false;
        }
    }

    void publish(FaultOrder order) throws Exception {
        System.out.println(CAUTION);
        LinkSecurity security = auth.resolve(broker, System.getenv()); // refuses a non-loopback broker without auth
        System.err.println(security.startMessage());
        TopicTree topics = TopicTree.forSite(resolvedSiteId(System.err::println));
        byte[] payload = new MessageCodec().encode(order);
        MqttLinkConfig config = security.applyTo(MqttLinkConfig.builder().serverUri(broker)
                .clientId("fault-cli-" + order.seq()), null).build();
        MqttLink link = new MqttLink(config, WallClock.INSTANCE);
        try {
            link.start();
            if (!link.awaitConnected(5000)) {
                throw new IllegalStateException("cannot reach the broker at " + broker + " within 5 s");
            }
            link.publish(new OutboundMessage(topics.faults(), payload, Qos.AT_LEAST_ONCE, false, 0)).get(5, TimeUnit.SECONDS);
        } finally {
            link.close();
        }
    }
}
