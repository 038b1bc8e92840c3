package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.security.AuthPolicy.Decision;
import org.loopstand.protocol.security.AuthPolicy.Settings;

class AuthPolicyTest {
    @Test
    void shouldAllowInsecureOnlyOnLoopbackAndSaySoLoudly() {
        for (String uri : new String[] {"tcp://127.0.0.1:1883", "tcp://localhost:1883", "tcp://[::1]:1883",
                "tcp://127.0.0.2:1883"}) {
            Decision d = AuthPolicy.decide(new Settings(uri, true, false, false));
            assertThat(d.allowed()).as(uri).isTrue();
            assertThat(d.insecure()).isTrue();
            assertThat(d.message()).contains("INSECURE MODE");
        }
        Decision remote = AuthPolicy.decide(new Settings("tcp://10.1.2.3:1883", true, false, false));
        assertThat(remote.allowed()).isFalse();
        assertThat(remote.message()).contains("--insecure is allowed only with a loopback broker").contains("10.1.2.3");
        assertThat(AuthPolicy.decide(new Settings("tcp://gateway.plant.example:1883", true, true, true)).allowed())
                .as("a name is not resolved, so it is not loopback").isFalse();
    }

    @Test
    void shouldRefuseToStartWithoutAuthUnlessInsecure() {
        Decision d = AuthPolicy.decide(new Settings("tcp://127.0.0.1:1883", false, false, false));
        assertThat(d.allowed()).isFalse();
        assertThat(d.problems()).hasSize(2);
        assertThat(d.message()).contains("username/password").contains("LOOPSTAND_KEYS_FILE");
    }

    @Test
    void shouldRequireTlsForARemoteBroker() {
        Decision plain = AuthPolicy.decide(new Settings("tcp://10.1.2.3:1883", false, true, true));
        assertThat(plain.allowed()).isFalse();
        assertThat(plain.message()).contains("ssl://");
        Decision tls = AuthPolicy.decide(new Settings("ssl://10.1.2.3:8883", false, true, true));
        assertThat(tls.allowed()).isTrue();
        assertThat(tls.insecure()).isFalse();
        assertThat(AuthPolicy.decide(new Settings("tcp://127.0.0.1:1883", false, true, true)).allowed())
                .as("credentials and keys on loopback without TLS").isTrue();
    }

    @Test
    void shouldRefuseAnUnparsableUri() {
        assertThat(AuthPolicy.decide(new Settings("tcp://bad host:1", true, false, false)).allowed()).isFalse();
        assertThat(AuthPolicy.decide(new Settings(null, true, false, false)).allowed()).isFalse();
    }

    @Test
    void shouldDecideEveryNodeOfAClusterList() {
        Decision allLoopback = AuthPolicy.decide(new Settings("tcp://127.0.0.1:1883, tcp://127.0.0.2:1883", true,
                false, false));
        assertThat(allLoopback.allowed()).isTrue();
        Decision oneRemote = AuthPolicy.decide(new Settings("tcp://127.0.0.1:1883,tcp://10.1.2.3:1883", true, false,
                false));
        assertThat(oneRemote.allowed()).as("one node off loopback makes the list off loopback").isFalse();
        assertThat(oneRemote.message()).endsWith("not 10.1.2.3");
        Decision plainCluster = AuthPolicy.decide(new Settings("tcp://10.1.2.3:1883,tcp://10.1.2.4:1883", false,
                true, true));
        assertThat(plainCluster.message()).contains("10.1.2.3, 10.1.2.4 are not loopback");
        assertThat(AuthPolicy.decide(new Settings("ssl://10.1.2.3:8883,ssl://10.1.2.4:8883", false, true, true))
                .allowed()).isTrue();
        Decision mixed = AuthPolicy.decide(new Settings("ssl://10.1.2.3:8883,tcp://10.1.2.4:1883", false, true, true));
        assertThat(mixed.allowed()).isFalse();
        assertThat(mixed.message()).contains("mixes tcp:// and ssl://");
    }

    @Test
    void shouldCallABrokerListLoopbackOnlyWhenEveryNodeIs() {
        assertThat(AuthPolicy.isLoopbackBroker("tcp://127.0.0.1:1883")).isTrue();
        assertThat(AuthPolicy.isLoopbackBroker("tcp://127.0.0.1:1883,tcp://[::1]:1884, tcp://localhost:1885")).isTrue();
        assertThat(AuthPolicy.isLoopbackBroker("tcp://127.0.0.1:1883,tcp://192.0.2.10:1883")).isFalse();
        assertThat(AuthPolicy.isLoopbackBroker("tcp://broker.example:1883,tcp://127.0.0.1:1883")).isFalse();
        assertThat(AuthPolicy.isLoopbackBroker("tcp://127.0.0.1:1883,tcp://127.0.0.1:1883")).as("repeat: invalid").isFalse();
        assertThat(AuthPolicy.isLoopbackBroker("")).isFalse();
        assertThat(AuthPolicy.isLoopbackBroker(null)).isFalse();
    }
}
