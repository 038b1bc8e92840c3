package org.loopstand.protocol.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;

class OldSpellingsTest {
    private final OldSpellings names = OldSpellings.of("--port", "--broker-port", "--out", "--runs-dir");

    @Test
    void shouldNameEachOldSpellingWithItsNewOne() {
        List<String> told = new ArrayList<>();
        int n = names.warn(List.of("rehearse", "--port", "1999", "--out=runs2", "--rate", "5"), told::add);
        assertThat(n).isEqualTo(2);
        assertThat(told).containsExactly(
                "deprecated: --port is now --broker-port; the old spelling goes in release 0.2.0",
                "deprecated: --out is now --runs-dir; the old spelling goes in release 0.2.0");
    }

    @Test
    void shouldStayQuietForNewSpellingsAndPositionalParameters() {
        assertThat(names.lines(List.of("--broker-port", "1999", "--runs-dir", "r", "--", "--port"))).isEmpty();
    }

    @Test
    void shouldRefuseAnOddList() {
        assertThatThrownBy(() -> OldSpellings.of("--port")).hasMessageContaining("pairs");
    }
}
