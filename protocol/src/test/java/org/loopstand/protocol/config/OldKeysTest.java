package org.loopstand.protocol.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class OldKeysTest {
    @Test
    void shouldNameTheOldKeyAtItsPlaceWithItsNewSpelling() {
        YamlNode old = YamlNode.read("s.yaml", "# a scenario\nsite: demo-site\ndurationS: 60\n");
        assertThat(OldKeys.SCENARIO.lines(old)).containsExactly(
                "s.yaml:2:1: deprecated: key 'site' is now 'siteId'; the old spelling goes in release 0.2.0");
        assertThat(OldKeys.SCENARIO.lines(YamlNode.read("n.yaml", "siteId: demo-site\n"))).isEmpty();
    }

    @Test
    void shouldReadEitherSpellingButRefuseBoth() {
        List<String> problems = new ArrayList<>();
        MappingReader old = new MappingReader(YamlNode.read("o.yaml", "site: a\n"), "the scenario", problems);
        assertThat(old.requiredString(old.renamedKey("site", "siteId"))).isEqualTo("a");
        MappingReader now = new MappingReader(YamlNode.read("n.yaml", "siteId: b\n"), "the scenario", problems);
        assertThat(now.requiredString(now.renamedKey("site", "siteId"))).isEqualTo("b");
        old.finish();
        now.finish();
        assertThat(problems).isEmpty();
        MappingReader both = new MappingReader(YamlNode.read("b.yaml", "site: a\nsiteId: b\n"), "the scenario", problems);
        assertThat(both.renamedKey("site", "siteId")).isEqualTo("siteId");
        assertThat(problems).containsExactly("b.yaml:1:1: site of the scenario is the old spelling of siteId; write only siteId");
    }
}
