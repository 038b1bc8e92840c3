package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.broker.SharedEmbeddedBroker;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultOrderHandler;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.FaultType;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;
import picocli.CommandLine;

class FaultCommandTest {
    @Test
    void shouldListEveryFaultTypeWithItsParametersAndUnits() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        FaultCommand.print(new PrintStream(buf, true, StandardCharsets.UTF_8));
        String text = buf.toString(StandardCharsets.UTF_8);
        for (FaultType t : FaultLibrary.standard().types()) {
            assertThat(text).contains(t.name() + " (");
        }
        assertThat(text).contains("--param delayMs=…  [0, 600000] ms, default 1000: fixed delay");
    }

    @Test
    void shouldRefuseAnUnknownParameterBeforeSendingAnything() {
        int code = new CommandLine(new PlantCli()).execute("fault", "--broker", "tcp://127.0.0.1:1", "start", "--type", "delay",
                "--target", "north-basin", "--param", "delaySeconds=3");
        assertThat(code).isEqualTo(2);
    }

    @Test
    void shouldRefuseANonLoopbackBrokerWithoutAuthAndPrintTheCaution() {
        java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
        java.io.PrintStream old = System.out;
        System.setOut(new java.io.PrintStream(out, true, java.nio.charset.StandardCharsets.UTF_8));
        int code;
        try {
            // TEST-NET-1 (RFC 5737): never routed
            code = new CommandLine(new PlantCli()).execute("fault", "--broker", "tcp://192.0.2.10:1883", "start", "--type",
                    "delay", "--target", "basin-steam-1", "--param", "delayMs=100");
        } finally {
            System.setOut(old);
        }
        assertThat(code).isEqualTo(1);
        assertThat(out.toString(java.nio.charset.StandardCharsets.UTF_8)).contains(FaultCommand.CAUTION);
    }

    @Test
    void shouldStartAndStopAFaultInARunningPlantThroughTheBroker() throws Exception {
        String uri = SharedEmbeddedBroker.serverUri();
        String site = "fault-cli-" + Long.toHexString(System.nanoTime());
        VirtualClock clock = new VirtualClock(1_767_225_600_000L);
        TargetCatalog catalog = TargetCatalog.of(SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml")));
        FaultEngine engine = new FaultEngine(clock, clock.epochMillis(), FaultObserver.NONE);
        FaultOrderHandler handler = new FaultOrderHandler(engine, FaultLibrary.standard(), catalog, new MessageCodec(),
                FaultObserver.NONE, clock);
        MqttLink plant = new MqttLink(MqttLinkConfig.builder().serverUri(uri).clientId(site + "-plant").build(), clock);
        try {
            handler.subscribe(plant, TopicTree.forSite(site));
            plant.start();
            assertThat(plant.awaitConnected(10_000)).isTrue();
            int code = new CommandLine(new PlantCli()).execute("fault", "--broker", uri, "--site", site, "start", "--type", "delay",
                    "--target", "ridge-hydro-1", "--param", "delayMs=2500", "--order", "op-7", "--duration-s", "60");
            assertThat(code).isZero();
            await().atMost(Duration.ofSeconds(10)).until(() -> {
                handler.doWork();
                return !engine.active().isEmpty();
            });
            FaultSpec f = engine.active().get(0);
            assertThat(f.id()).isEqualTo("op-7");
            assertThat(f.number("delayMs")).isEqualTo(2500.0);
            assertThat(f.endS() - f.startS()).isEqualTo(60.0);
            code = new CommandLine(new PlantCli()).execute("fault", "--broker", uri, "--site", site, "stop", "--order", "op-7");
            assertThat(code).isZero();
            await().atMost(Duration.ofSeconds(10)).until(() -> {
                handler.doWork();
                return engine.active().isEmpty();
            });
        } finally {
            plant.close();
        }
    }
}
