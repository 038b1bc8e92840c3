package org.loopstand.protocol.security.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.topic.TopicTree;

class BrokerAccessModelTest {
    private static final TopicTree T = TopicTree.forSite("rig1");
    private static final BrokerAccessModel MODEL = BrokerAccessModel.forSite("rig1").controller("controller-1")
            .unit("G1").unit("G2").area("A1").build();

    @Test
    void shouldLetOnlyTheControllerPublishCommandsAndStatus() {
        for (BrokerIdentity id : MODEL.identities()) {
            boolean controller = id.username().equals("controller-1");
            assertThat(id.mayPublish(T.unitCommand("G1"))).as(id.username()).isEqualTo(controller);
            assertThat(id.mayPublish(T.controllerStatus("controller-1"))).as(id.username()).isEqualTo(controller);
            // the fault tool, and the plant, whose scenario sends the operator's mode changes to units elsewhere
            assertThat(id.mayPublish(T.faults())).as(id.username())
                    .isEqualTo(id.username().equals("fault-tool") || id.username().equals("plant"));
        }
        assertThat(MODEL.identity("controller-1").orElseThrow().mayPublish(T.controllerStatus("controller-2")))
                .isFalse();
    }

    @Test
    void shouldConfineAUnitToItsOwnTopics() {
        BrokerIdentity g1 = MODEL.identity("unit-G1").orElseThrow();
        assertThat(g1.mayPublish(T.unitTelemetry("G1"))).isTrue();
        assertThat(g1.mayPublish(T.unitAck("G1"))).isTrue();
        assertThat(g1.mayPublish(T.unitLink("G1"))).isTrue();
        assertThat(g1.mayPublish(T.fieldReference("G1"))).isTrue();
        assertThat(g1.mayPublish(T.unitTelemetry("G2"))).isFalse();
        assertThat(g1.mayPublish(T.unitAck("G2"))).isFalse();
        assertThat(g1.mayPublish(T.fieldReference("G2"))).isFalse();
        assertThat(g1.maySubscribe(T.unitCommand("G1"))).isTrue();
        assertThat(g1.maySubscribe(T.unitCommand("G2"))).isFalse();
        assertThat(g1.maySubscribe(T.filterEverything())).isFalse();
        assertThat(g1.maySubscribe(T.root() + "/unit/+/command")).isFalse();
        assertThat(g1.mayReceive(T.unitCommand("G2"))).isFalse();
        assertThat(g1.mayReceive(T.controllerStatus("controller-1"))).isTrue();
    }

    @Test
    void shouldConfineAMeterToItsArea() {
        BrokerIdentity m = MODEL.identity("meter-A1").orElseThrow();
        assertThat(m.mayPublish(T.areaMeter("A1", "M1"))).isTrue();
        assertThat(m.mayPublish(T.areaMeter("A2", "M1"))).isFalse();
        assertThat(m.mayPublish(T.areaSchedule("A1"))).isFalse();
    }

    @Test
    void shouldRenderAMosquittoAclWithOneBlockPerIdentity() {
        String acl = MODEL.toMosquittoAcl();
        assertThat(acl.lines().filter(l -> l.startsWith("user "))).containsExactly("user controller-1", "user plant",
                "user fault-tool", "user meter-A1", "user unit-G1", "user unit-G2");
        assertThat(acl).contains("user unit-G1\ntopic read loopstand/v1/rig1/unit/G1/command\n")
                .contains("topic write loopstand/v1/rig1/unit/+/command")
                .doesNotContain("pattern").doesNotContain("#\n");
    }

    @Test
    void shouldRefuseBadIdsAllAtOnce() {
        assertThatThrownBy(() -> BrokerAccessModel.forSite("rig 1").unit("G/1").area("A#").build())
                .hasMessageContaining("site id 'rig 1'").hasMessageContaining("unit id 'G/1'")
                .hasMessageContaining("area id 'A#'").hasMessageContaining("no controller");
        assertThatThrownBy(() -> BrokerAccessModel.forSite("s").controller("plant").unit("G1").build())
                .hasMessageContaining("two identities named plant");
    }

    @Test
    void shouldRefusePlaceholderShortMissingAndUnknownPasswordsWithoutEchoingThem(@TempDir Path dir) throws Exception {
        Path users = dir.resolve("users.properties");
        Files.writeString(users, String.join("\n", "controller-1 = CHANGE-ME", "plant = short-pw",
                "fault-tool = a-long-enough-password", "intruder = another-long-password",
                "meter-A1 = a-long-enough-password", "unit-G1 = a-long-enough-password"));
        assertThatThrownBy(() -> MosquittoFiles.loadPasswords(users, MODEL))
                .hasMessageContaining("controller-1 is a placeholder").hasMessageContaining("plant is a placeholder")
                .hasMessageContaining("no password for unit-G2").hasMessageContaining("user intruder is not")
                .hasMessageNotContaining("short-pw").hasMessageNotContaining("a-long-enough-password");
    }

    @Test
    void shouldHashPasswordsInMosquittoPbkdf2Format() {
        String h = MosquittoFiles.hashPassword("a-long-enough-password", new byte[12], 101);
        // $7$ = PBKDF2-HMAC-SHA512 in mosquitto 2 (from memory); 12-byte salt -> 16 base64 chars,
        // 64-byte hash -> 88 base64 chars. Accepted by a real broker in BrokerAclMosquittoTest.
        assertThat(h).matches("\\$7\\$101\\$AAAAAAAAAAAAAAAA\\$[A-Za-z0-9+/]{86}==");
        assertThat(MosquittoFiles.hashPassword("x-long-enough-password")).isNotEqualTo(
                MosquittoFiles.hashPassword("x-long-enough-password"));
    }

    @Test
    void shouldRefuseATemplatePlaceholderWithoutValue() {
        assertThatThrownBy(() -> MosquittoFiles.renderTemplate("a ${ONE} ${TWO}", Map.of("ONE", "1")))
                .hasMessageContaining("TWO");
        assertThat(MosquittoFiles.renderTemplate("port ${P}$", Map.of("P", "8883"))).isEqualTo("port 8883$");
    }

    @Test
    void shouldMatchAnAclRuleAsASubscriptionWouldIncludingDollarTopics() {
        // MQTT 5.0 (OASIS, 2019) 4.7: '#' also matches the parent level; 4.7.2: a topic starting with '$'
        // does not match a filter starting with a wildcard
        AclRule all = new AclRule(Access.READWRITE, "#");
        AclRule units = new AclRule(Access.READ, "loopstand/v1/rig1/unit/+/command");
        assertThat(all.matchesTopic("loopstand/v1/rig1/run")).isTrue();
        assertThat(all.matchesTopic("$SYS/broker/uptime")).isFalse();
        assertThat(units.matchesTopic("loopstand/v1/rig1/unit/g1/command")).isTrue();
        assertThat(units.matchesTopic("loopstand/v1/rig1/unit/g1/command/extra")).isFalse();
        assertThat(units.matchesTopic("loopstand/v1/rig1/unit/command")).isFalse();
        assertThat(new AclRule(Access.READ, "loopstand/v1/rig1/#").matchesTopic("loopstand/v1/rig1")).isTrue();
    }
}
