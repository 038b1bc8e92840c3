package org.loopstand.app.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.catchThrowableOfType;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.assertj.core.api.ThrowableAssert.ThrowingCallable;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.pulsetest.plan.TestPlanLoader;
import org.loopstand.controller.pulsetest.programme.SiteUnitReader;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.network.CommandRunner;
import org.loopstand.plant.network.NamespaceHostLinks;
import org.loopstand.plant.profile.WireProfileLoader;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.config.ConfigFileException;

/**
 * Every kind of configuration file, read by whichever part of the rig reads it, names a problem in one
 * form: {@code file:line:column: message}.
 */
class ConfigErrorFormTest {
    private static final Path CONFIG = Path.of("..", "config");
    private static final Path DEMO_SITE = CONFIG.resolve("sites/demo-site.yaml");

    @TempDir
    Path tmp;

    /** The demo site with one change: line 31 ("    droopPct: 5") of basin-steam-1 given a word. */
    private Path demoSiteWith(String from, String to) throws Exception {
        String text = Files.readString(DEMO_SITE);
        assertThat(text).contains(from);
        return write("site.yaml", text.replaceFirst(Pattern.quote(from), to));
    }

    private Path write(String name, String text) throws Exception {
        Path p = tmp.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    /** @return the problems, after checking every one of them has the one form */
    private static java.util.List<String> problems(Path file, ThrowingCallable read) {
        ConfigFileException e = catchThrowableOfType(ConfigFileException.class, read);
        assertThat(e).as("a refusal of " + file).isNotNull();
        assertThat(e.problems()).isNotEmpty()
                .allSatisfy(p -> assertThat(p).matches(Pattern.quote(file.toString()) + ":\\d+:\\d+: \\S.*"));
        return e.problems();
    }

    @Test
    void shouldNameASiteProblemForThePlantInTheOneForm() throws Exception {
        Path site = demoSiteWith("droopPct: 5", "droopPct: five");
        assertThat(problems(site, () -> SiteLoader.load(site)))
                .containsExactly(site + ":31:15: droopPct of unit basin-steam-1 must be a number, got 'five'");
    }

    @Test
    void shouldNameAHostsFileProblemInTheOneForm() throws Exception {
        Path hosts = write("hosts.yaml", """
                hosts: [plant-host, control-host]
                links:
                  - {between: [plant-host], namespace: lab-hub, interfaces: [hub-p3], colour: red}
                """);
        assertThat(problems(hosts, () -> NamespaceHostLinks.read(hosts, CommandRunner.SYSTEM))).containsExactly(
                hosts + ":3:6: link #1: between names two different hosts, got [plant-host]",
                hosts + ":3:71: unknown key 'colour' in link #1; allowed here: [between, namespace, interfaces]");
    }

    @Test
    void shouldNameTheSameSiteProblemForTheControllerAndThePulseTestAtTheSamePlace() throws Exception {
        Path site = demoSiteWith("droopPct: 5", "droopPct: five");
        String expected = site + ":31:15: droopPct of unit basin-steam-1 must be a number, got 'five'";
        assertThat(problems(site, () -> ControllerSiteReader.read(site))).containsExactly(expected);
        assertThat(problems(site, () -> SiteUnitReader.read(site, "basin-steam-1"))).containsExactly(expected);
    }

    @Test
    void shouldNameAControllerSettingsProblemInTheOneForm() throws Exception {
        Path site = write("ctl.yaml", """
                siteId: s
                areas:
                  - {id: a1, nominalFrequencyHz: 50, aceConvention: european, kMwPerHz: 1000}
                controller:
                  pulses: {minPulseMs: 250.5}
                  cycle: 4
                """);
        assertThat(problems(site, () -> ControllerSiteReader.read(site))).containsExactly(
                site + ":5:24: minPulseMs of controller.pulses must be a whole number, got '250.5'",
                site + ":6:3: unknown key 'cycle' in controller (did you mean 'cycleS'?); allowed here: [cycleS, aceMode,"
                        + " regulation, pulses, interlock, following, commandSettleMs, redispatch, intake]");
    }

    @Test
    void shouldNameAScenarioProblemInTheOneForm() throws Exception {
        Grid grid = SiteLoader.load(DEMO_SITE);
        Path scenario = write("scenario.yaml", """
                siteId: demo-site
                durationS: 600
                events:
                  - {atS: 30, type: loadStep, area: north-basin, deltaMw: 80}
                  - {atS: 700, type: loadStep, area: north-basin, deltaMw: 80}
                """);
        assertThat(problems(scenario, () -> RunScenarioLoader.load(scenario, EventTypeRegistry.physics(), grid)))
                .singleElement().asString().startsWith(scenario + ":5:6: atS 700.0 s is not before the run's end");
    }

    @Test
    void shouldNameAPlanProblemInTheOneForm() throws Exception {
        Path plan = write("plan.yaml", """
                name: p
                limits: {maxExcursionMw: 20, maxDurationS: 0}
                steps:
                  - {kind: hold, durationS: 60}
                """);
        assertThat(problems(plan, () -> TestPlanLoader.load(plan)))
                .containsExactly(plan + ":2:30: maxDurationS of limits = 0 is outside (0, 86400]");
    }

    @Test
    void shouldNameAWireProfileProblemInTheOneForm() throws Exception {
        Path profile = write("profile.yaml", """
                profile: p
                messages:
                  AreaMetre:
                    topic: gw/{site}/a/{area}/m/{meter}
                """);
        assertThat(problems(profile, () -> WireProfileLoader.load(profile, "demo-site")))
                .singleElement().asString()
                .startsWith(profile + ":3:3: unknown message 'AreaMetre' (did you mean 'AreaMeter'?)");
    }

    @Test
    void shouldNameBrokenYamlInTheOneFormWhateverReadsIt() throws Exception {
        Path broken = write("broken.yaml", "siteId: s\nareas: [\n  - a: b\n");
        for (ThrowingCallable read : java.util.List.<ThrowingCallable>of(() -> SiteLoader.load(broken),
                () -> ControllerSiteReader.read(broken), () -> TestPlanLoader.load(broken))) {
            assertThat(problems(broken, read)).singleElement().asString().contains("not valid YAML");
        }
    }
}
