package org.loopstand.protocol.config;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class InstallFolderTest {
    @TempDir
    Path dir;

    @Test
    void shouldTakeTheHomeFromTheLaunchersVariableElseTheWorkingDirectory() {
        assertThat(InstallFolder.of(Map.of("LOOPSTAND_HOME", "/opt/rig")).shipped("config/plans/standard.yaml"))
                .isEqualTo(Path.of("/opt/rig/config/plans/standard.yaml"));
        assertThat(InstallFolder.of(Map.of()).home()).isEqualTo(Path.of("."));
        assertThat(InstallFolder.of(Map.of("LOOPSTAND_HOME", " ")).home()).isEqualTo(Path.of("."));
    }

    @Test
    void shouldFindASiteBesideTheScenarioBeforeTheShippedOne() throws IOException {
        Path home = Files.createDirectories(dir.resolve("home/config/sites"));
        Files.writeString(home.resolve("lakes.yaml"), "siteId: lakes\n");
        Path mine = Files.createDirectories(dir.resolve("work/scenarios"));
        Path scenario = Files.writeString(mine.resolve("trip.yaml"), "siteId: lakes\n");
        InstallFolder install = InstallFolder.of(Map.of("LOOPSTAND_HOME", dir.resolve("home").toString()));

        assertThat(install.siteFor(scenario, "lakes")).isEqualTo(home.resolve("lakes.yaml"));

        Path sites = Files.createDirectories(dir.resolve("work/sites"));
        Files.writeString(sites.resolve("lakes.yaml"), "siteId: lakes\n");
        assertThat(install.siteFor(scenario, "lakes")).isEqualTo(sites.resolve("lakes.yaml"));

        Files.writeString(mine.resolve("lakes.yaml"), "siteId: lakes\n");
        assertThat(install.siteFor(scenario, "lakes")).isEqualTo(mine.resolve("lakes.yaml"));
    }

    @Test
    void shouldNameEveryPlaceLookedInAndTheSiteIdsPlaceWhenNoSiteFileExists() throws IOException {
        Path scenario = Files.writeString(dir.resolve("trip.yaml"), "siteId: nowhere\n");
        InstallFolder install = InstallFolder.of(Map.of("LOOPSTAND_HOME", dir.resolve("home").toString()));

        assertThatThrownBy(() -> install.siteFor(scenario, "nowhere"))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("no site file for siteId 'nowhere' of " + scenario + ":1:9 (looked for ")
                .hasMessageContaining(dir.resolve("nowhere.yaml").toString())
                .hasMessageContaining(dir.resolve("home/config/sites/nowhere.yaml").toString())
                .hasMessageEndingWith("give --site FILE");
    }
}
