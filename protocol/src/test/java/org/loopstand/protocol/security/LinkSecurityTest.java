package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;

class LinkSecurityTest {
    @TempDir
    Path dir;

    private Path keys() throws Exception {
        return Files.writeString(dir.resolve("keys"), "G1.k1 = " + Base64.getEncoder().encodeToString(TestKeys.bytes("G1.k1")) + "\n");
    }

    private Path secret(String name, String value) throws Exception {
        return Files.writeString(dir.resolve(name), value + "\n");
    }

    @Test
    void shouldRunTheDefaultLoopbackDemoInsecureWithTheBannerWhenNoOptionIsGiven() throws Exception {
        LinkSecurity s = new AuthOptions().resolve("tcp://127.0.0.1:1884", Map.of());
        assertThat(s.insecure()).isTrue();
        assertThat(s.signsCommands()).isFalse();
        assertThat(s.startMessage()).contains("running as --insecure").contains("INSECURE MODE");
    }

    @Test
    void shouldRefuseANonLoopbackBrokerWithoutAuthAndInsecureThere() {
        assertThatThrownBy(() -> new AuthOptions().resolve("tcp://10.1.2.3:1883", Map.of()))
                .isInstanceOf(SecuritySetupException.class).hasMessageContaining("no broker username/password")
                .hasMessageContaining("use an ssl:// URL").hasMessageContaining("no command keys");
        assertThatThrownBy(() -> new AuthOptions().insecure(true).resolve("tcp://10.1.2.3:1883", Map.of()))
                .isInstanceOf(SecuritySetupException.class).hasMessageContaining("--insecure is allowed only with a loopback");
    }

    @Test
    void shouldRunAnAllLoopbackNodeListAsTheDefaultDemoButNotAListWithOneRemoteNode() throws Exception {
        LinkSecurity s = new AuthOptions().resolve("tcp://127.0.0.1:1884, tcp://[::1]:1885,tcp://localhost:1886", Map.of());
        assertThat(s.insecure()).isTrue();
        assertThat(s.startMessage()).contains("running as --insecure");
        assertThatThrownBy(() -> new AuthOptions().resolve("tcp://127.0.0.1:1884,tcp://192.0.2.7:1884", Map.of()))
                .isInstanceOf(SecuritySetupException.class).hasMessageContaining("192.0.2.7 is not loopback");
    }

    @Test
    void shouldRefuseAPartialSecuredSetupOnLoopbackInsteadOfFallingBackToInsecure() throws Exception {
        // keys without credentials: asking for security switches the implicit demo mode off
        assertThatThrownBy(() -> new AuthOptions().keysFile(keys()).resolve("tcp://127.0.0.1:1884", Map.of()))
                .isInstanceOf(SecuritySetupException.class).hasMessageContaining("no broker username/password");
        assertThatThrownBy(() -> new AuthOptions().username("controller-1").resolve("tcp://127.0.0.1:1884", Map.of()))
                .isInstanceOf(SecuritySetupException.class).hasMessageContaining("needs --password-file");
    }

    @Test
    void shouldResolveASecuredSetupAndApplyCredentialsWithoutEchoingThePassword() throws Exception {
        Path pw = secret("pw", "a-password-of-20-chars");
        LinkSecurity s = new AuthOptions().username("controller-1").passwordFile(pw).keysFile(keys())
                .resolve("tcp://127.0.0.1:1884", Map.of());
        assertThat(s.signsCommands()).isTrue();
        assertThat(s.keys().orElseThrow().find("G1", "k1")).isPresent();
        MqttLinkConfig c = s.applyTo(MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:1884").clientId("x"), null).build();
        assertThat(c.username()).contains("controller-1");
        assertThat(new String(c.password().orElseThrow())).isEqualTo("a-password-of-20-chars");
        assertThat(s.toString()).doesNotContain("a-password-of-20-chars");
        assertThat(s.startMessage()).doesNotContain("a-password-of-20-chars").contains("command signing");
    }

    @Test
    void shouldTakeKeysFromTheEnvironmentAndIdentitiesFromACredentialsFile() throws Exception {
        Path users = Files.writeString(dir.resolve("users"), "# users\nplant = plant-password-xxxxxxx\nunit-G1 = unit-password-xxxxxxxx\n");
        LinkSecurity s = new AuthOptions().credentialsFile(users)
                .resolve("tcp://127.0.0.1:1884", Map.of(KeyRing.KEYS_FILE_ENV, keys().toString()));
        assertThat(s.hasPasswordFor("unit-G1")).isTrue();
        assertThat(s.hasPasswordFor("unit-G2")).isFalse();
        assertThatThrownBy(() -> s.applyTo(MqttLinkConfig.builder(), "unit-G2"))
                .hasMessageContaining("no broker password for identity unit-G2");
    }

    @Test
    void shouldRefuseAnEmptyPasswordFileAndAPlaceholderInTheUsersFile() throws Exception {
        Path empty = Files.writeString(dir.resolve("empty"), "\n");
        assertThatThrownBy(() -> new AuthOptions().username("u").passwordFile(empty).keysFile(keys())
                .resolve("tcp://127.0.0.1:1884", Map.of())).hasMessageContaining("the first line is empty");
        Path users = Files.writeString(dir.resolve("users"), "plant = CHANGE-ME\n");
        assertThatThrownBy(() -> new AuthOptions().credentialsFile(users).keysFile(keys())
                .resolve("tcp://127.0.0.1:1884", Map.of())).hasMessageContaining("empty or a placeholder")
                .hasMessageNotContaining("CHANGE-ME =");
    }
}
