package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.Base64;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class KeyRingTest {
    private static final String K1 = Base64.getEncoder().encodeToString(TestKeys.bytes("a"));
    private static final String K2 = Base64.getEncoder().encodeToString(TestKeys.bytes("b"));

    @Test
    void shouldLoadKeysWithValidityWindowsFromAFileNamedByTheEnvironment(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("keys.properties");
        Files.writeString(file, String.join("\n",
                "# rotation of G1",
                "G1.k2025a = " + K1,
                "G1.k2025a.validUntil = 2025-07-01T00:00:00Z",
                "G1.k2025b = " + K2,
                "G1.k2025b.validFrom = 1750723200000",
                "G2.only=" + K1));

        KeyRing ring = KeyRing.fromEnvironment(Map.of(KeyRing.KEYS_FILE_ENV, file.toString())).orElseThrow();

        assertThat(ring.size()).isEqualTo(3);
        UnitKey a = ring.find("G1", "k2025a").orElseThrow();
        assertThat(a.validUntilMs()).isEqualTo(Instant.parse("2025-07-01T00:00:00Z").toEpochMilli());
        assertThat(a.secret()).isEqualTo(TestKeys.bytes("a"));
        // 1750723200000 = 2025-06-24T00:00:00Z (re-derived with Instant.ofEpochMilli)
        long overlap = Instant.parse("2025-06-25T00:00:00Z").toEpochMilli();
        assertThat(ring.signingKey("G1", overlap).orElseThrow().keyId()).isEqualTo("k2025b");
        assertThat(ring.signingKey("G1", Instant.parse("2025-06-01T00:00:00Z").toEpochMilli()).orElseThrow().keyId())
                .isEqualTo("k2025a");
        assertThat(ring.find("G3", "k2025a")).isEmpty();
    }

    @Test
    void shouldBeEmptyWhenTheEnvironmentNamesNoFile() throws Exception {
        assertThat(KeyRing.fromEnvironment(Map.of())).isEmpty();
    }

    @Test
    void shouldNeverPrintKeyMaterial() {
        KeyRing ring = KeyRing.of(List.of(TestKeys.key("G1", "k1")));
        String text = ring + " " + ring.find("G1", "k1").orElseThrow();
        assertThat(text).contains("G1").contains("k1")
                .doesNotContain(Base64.getEncoder().encodeToString(TestKeys.bytes("G1.k1")));
    }

    @Test
    void shouldRefuseShortKeysWithoutEchoingThem() {
        String shortKey = Base64.getEncoder().encodeToString(new byte[31]);
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1 = " + shortKey), "keys.properties"))
                .hasMessageContaining("31 bytes").hasMessageContaining("32").hasMessageNotContaining(shortKey);
    }

    @Test
    void shouldNameTheLineOfEveryMistake() {
        assertThatThrownBy(() -> KeyRing.parse(List.of("", "G1.k1 " + K1), "f"))
                .hasMessageContaining("f line 2").hasMessageNotContaining(K1.substring(0, 12));
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1 = %%%notbase64"), "f"))
                .hasMessageContaining("not valid base64").hasMessageNotContaining("%%%");
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1 = " + K1, "G1.k1 = " + K2), "f"))
                .hasMessageContaining("line 2").hasMessageContaining("duplicate");
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1.validFrom = 5"), "f"))
                .hasMessageContaining("G1.k1 is missing");
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1 = " + K1, "G1.k1.validUntil = tomorrow"), "f"))
                .hasMessageContaining("line 2").hasMessageContaining("tomorrow");
        assertThatThrownBy(() -> KeyRing.parse(List.of("G1.k1 = " + K1, "G1.k1.validFrom = 10",
                "G1.k1.validUntil = 10"), "f")).hasMessageContaining("must be after validFrom");
        assertThatThrownBy(() -> KeyRing.parse(List.of("G 1.k1 = " + K1), "f")).hasMessageContaining("f line 1");
    }
}
