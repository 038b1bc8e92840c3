package org.loopstand.brokernode;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class BrokerNodeSettingsTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");

    @TempDir
    Path dir;

    @Test
    void shouldRefuseANetworkedNodeWithoutLoginsAndNameEveryProblem() {
        BrokerNodeSettings s = new BrokerNodeSettings("n 1", "10.231.0.1", 1883, 1883, List.of("10.231.0.2:x"),
                CONFIG, null, null, dir.resolve("n1.p12"), null);
        assertThat(s.check()).containsExactly(
                "--name must be 1..64 letters, digits or '-', got 'n 1'",
                "--mqtt-port and --cluster-port must differ, both are 1883",
                "a three-node cluster needs exactly two --peer host:port, got 1 [10.231.0.2:x]",
                "--peer must be host:port with a port in 1..65535, got '10.231.0.2:x'",
                "node listens on 10.231.0.1, not loopback: give --users FILE so every MQTT client must log in",
                "node listens on 10.231.0.1, not loopback: give --cluster-password-file FILE (the same on every node)",
                "--key-store " + dir.resolve("n1.p12") + " does not exist or is not readable",
                "--key-store and --key-store-password-file go together");
    }

    @Test
    void shouldAllowALoopbackNodeWithoutLoginsAsInsecure() {
        BrokerNodeSettings s = new BrokerNodeSettings("n1", "127.0.0.1", 21883, 26616,
                List.of("127.0.0.1:26617", "127.0.0.1:26618"), CONFIG, null, null, null, null);
        assertThat(s.check()).isEmpty();
        assertThat(s.insecure()).isTrue();
        assertThat(s.mqttUri()).isEqualTo("tcp://127.0.0.1:21883");
    }

    @Test
    void shouldFillEveryPlaceholderOfTheShippedBrokerFile() throws Exception {
        BrokerNodeSettings s = new BrokerNodeSettings("n2", "10.231.0.2", 1883, 61616,
                List.of("10.231.0.1:61616", "10.231.0.3:61616"), CONFIG, null, null, Path.of("/etc/ls/n2.p12"), Path.of("pw"));
        String xml = BrokerNode.fill(CONFIG, s.placeholders("p<&>w", "store-pass"));
        assertThat(xml).doesNotContain("${")
                .contains("<name>n2</name>")
                .contains("tcp://10.231.0.2:1883?protocols=MQTT;tcpNoDelay=true;useEpoll=false;sslEnabled=true;"
                        + "keyStoreType=PKCS12;keyStorePath=/etc/ls/n2.p12;keyStorePassword=store-pass</acceptor>")
                .contains("<connector name=\"peer2\">tcp://10.231.0.3:61616")
                .contains("<cluster-password>p&lt;&amp;&gt;w</cluster-password>")
                .contains("<security-enabled>false</security-enabled>");
        assertThat(s.mqttUri()).isEqualTo("ssl://10.231.0.2:1883");
        // well-formed XML once filled (a "--" inside a comment, or an unescaped '&', would not parse)
        javax.xml.parsers.DocumentBuilderFactory.newInstance().newDocumentBuilder()
                .parse(new java.io.ByteArrayInputStream(xml.getBytes(java.nio.charset.StandardCharsets.UTF_8)));
        assertThatThrownBy(() -> s.placeholders("c", "a;b")).hasMessageContaining("must not contain ';', '=' or '&'");
    }

    @Test
    void shouldNameFileAndLineOfAPlaceholderWithoutAValue() throws Exception {
        Path template = Files.writeString(dir.resolve("b.xml"), "<a>\n  <b>${node.name}</b>\n  <c>${no.such}</c>\n</a>\n");
        assertThatThrownBy(() -> BrokerNode.fill(template, java.util.Map.of("node.name", "n1")))
                .hasMessageContaining(template + ":3: placeholder ${no.such} has no value");
    }
}
