package org.loopstand.app.campaign;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** A short base scenario and campaign files on the demo site, written into a test's folder. */
final class CampaignFiles {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml").toAbsolutePath().normalize();

    /**
     * 150 s: a 40 MW load step in the south at 10 s; frequency and ACE of the south back within 130 s. With the built-in
     * controller both pass in about a minute; with every south unit in local control, secondary control has no unit of the
     * area to move, the area's ACE stays tens of MW off to the end and both checks fail.
     */
    static final String SHORT_SCENARIO = """
            siteId: demo-site
            durationS: 150
            seed: 5
            startHourOfDay: 10
            rateX: 10
            events:
              - {atS: 10, type: loadStep, area: south-ridge, deltaMw: 40}
            checks:
              - {name: frequency-back, type: frequencyRestored, area: south-ridge, after: loadStep, withinS: 130, bandMhz: 20}
              - {name: ace-recovered, type: aceRecovered, area: south-ridge, after: loadStep, withinS: 130, toleranceMw: 10}
            """;

    private CampaignFiles() {
    }

    /** Writes short.yaml and {@code name} (the campaign text, with {@code siteFile} and {@code scenario} put in front) into {@code dir}. */
    static Path campaign(Path dir, String name, String body) throws IOException {
        Files.writeString(dir.resolve("short.yaml"), SHORT_SCENARIO);
        Path file = dir.resolve(name);
        Files.writeString(file, "siteId: demo-site\nsiteFile: " + SITE + "\nscenario: short.yaml\n" + body);
        return file;
    }
}
