package org.loopstand.app.rehearsal;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class RehearsalTest {
    @TempDir
    Path tmp;

    @Test
    void shouldFindTheSiteAScenarioNamesInEitherSpellingThroughTheYamlReader() throws Exception {
        Path now = Files.writeString(tmp.resolve("now.yaml"), "# comment: site: nope\nsiteId: 'demo-site'\ndurationS: 60\n");
        Path old = Files.writeString(tmp.resolve("old.yaml"), "durationS: 60\nsite: three-area   # the old key\n");
        Path broken = Files.writeString(tmp.resolve("broken.yaml"), "siteId: [demo-site\n");
        assertThat(Rehearsal.scenarioSiteId(now)).isEqualTo("demo-site");
        assertThat(Rehearsal.scenarioSiteId(old)).isEqualTo("three-area");
        assertThat(Rehearsal.topValue(now, "durationS")).isEqualTo("60");
        // not valid YAML: nothing here, the scenario's own reader refuses it at its line
        assertThat(Rehearsal.scenarioSiteId(broken)).isNull();
    }
}
