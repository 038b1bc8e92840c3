package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;

/**
 * The signing test vector of docs/controller-contract.md, § 9, is what the codec and the signer make:
 * a controller author who reproduces it byte for byte signs commands the units accept.
 */
class SigningTestVectorTest {
    private static final Pattern BLOCK = Pattern.compile("<!-- signing-vector -->\\s*```text\\n(.*?)```", Pattern.DOTALL);

    static Map<String, String> vector() throws Exception {
        Matcher m = BLOCK.matcher(Files.readString(Path.of("..", "docs", "controller-contract.md")));
        assertThat(m.find()).as("the signing vector block in docs/controller-contract.md").isTrue();
        Map<String, String> v = new LinkedHashMap<>();
        for (String line : m.group(1).split("\n")) {
            int colon = line.indexOf(':');
            if (colon > 0) {
                v.put(line.substring(0, colon).trim(), line.substring(colon + 1).trim());
            }
        }
        return v;
    }

    @Test
    void shouldMatchTheDocumentedCanonicalBytesAndSignature() throws Exception {
        Map<String, String> v = vector();
        UnitCommand c = new UnitCommand(378, 1798797600000L, "ridge-hydro-1", "controller-1", 1798797590000L, 1798797600000L,
                1798797608000L, CommandKind.PULSE, PulseDirection.RAISE, 2000, null, null, null);
        MessageCodec codec = new MessageCodec();
        byte[] canonical = CommandMac.canonicalBytes(codec, c, v.get("keyId"));
        assertThat(new String(canonical, StandardCharsets.UTF_8)).isEqualTo(v.get("canonical bytes"));
        byte[] secret = v.get("key (UTF-8)").getBytes(StandardCharsets.UTF_8);
        // HMAC-SHA256 computed by the JDK's own javax.crypto.Mac, independently of the signer (RFC 2104)
        Mac mac = Mac.getInstance("HmacSHA256");
        mac.init(new SecretKeySpec(secret, "HmacSHA256"));
        String expected = Base64.getEncoder().encodeToString(mac.doFinal(v.get("canonical bytes").getBytes(StandardCharsets.UTF_8)));
        UnitKey key = UnitKey.always("ridge-hydro-1", v.get("keyId"), secret);
        UnitCommand signed = new CommandSigner(KeyRing.of(java.util.List.of(key)),
                new org.loopstand.protocol.time.VirtualClock(1798797600000L), codec).sign(c);
        assertThat(signed.signature()).isEqualTo(expected).isEqualTo(v.get("signature"));
    }

    @Test
    void shouldAgreeWithTheJdkMacOnRfc4231TestCase2() throws Exception {
        // RFC 4231, test case 2: key "Jefe", data "what do ya want for nothing?"
        Mac mac = Mac.getInstance("HmacSHA256");
        mac.init(new SecretKeySpec("Jefe".getBytes(StandardCharsets.US_ASCII), "HmacSHA256"));
        byte[] out = mac.doFinal("what do ya want for nothing?".getBytes(StandardCharsets.US_ASCII));
        assertThat(java.util.HexFormat.of().formatHex(out))
                .isEqualTo("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843");
    }
}
