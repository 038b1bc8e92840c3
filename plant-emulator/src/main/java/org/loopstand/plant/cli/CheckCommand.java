package org.loopstand.plant.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;

import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.network.NamespaceHostLinks;
import org.loopstand.plant.physics.SmallSignalStability;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.OldKeys;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.plant.site.SiteLoader;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code loopstand check FILE...}: validates site and scenario files without running them. A site is loaded
 * and screened for small-signal stability (docs/physics.md); a scenario is loaded with every rehearsal
 * section against its site. Exit 0 when every file passes (warnings printed), 2 when any is refused or
 * cannot be checked here. Sends nothing.
 */
@Command(name = "check", mixinStandardHelpOptions = true,
        description = "Validate site and scenario files without running them (site: load and stability screen;"
                + " scenario: load against its site). Exit 0 all good, 2 on any refusal.")
public final class CheckCommand implements Callable<Integer> {
    @Parameters(arity = "1..*", paramLabel = "FILE", description = "site or scenario files (YAML)")
    private List<Path> files;

    @Option(names = "--site", description = "site file for the scenarios (default: <siteId>.yaml beside the scenario,"
            + " in a sites/ folder next to its own, or in the shipped config/sites/)")
    private Path site;

    @Option(names = "--hosts", paramLabel = "FILE", description = "hosts file that a scenario's network faults name hosts"
            + " of (docs/faults.md, \"Network faults\"): checked as the plant checks it, so the links' interfaces must"
            + " exist on this machine and a delay/loss fault probes netem (needs root)")
    private Path hostsFile;

    @Spec
    private CommandSpec spec;

    /** site files whose warnings this run of check printed already, absolute */
    private final java.util.Set<Path> sitesWarned = new java.util.HashSet<>();

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        boolean refused = false;
        for (Path file : files) {
            try {
                refused |= !check(file, out);
            } catch (ConfigFileException e) {
                e.problems().forEach(out::println);
                out.println(file + ": refused");
                refused = true;
            } catch (java.nio.file.NoSuchFileException e) {
                out.println(e.getFile() + ": no such file (relative paths start at " + Path.of("").toAbsolutePath() + ")");
                out.println(file + ": refused");
                refused = true;
            } catch (IOException e) {
                out.println(file + ": cannot read: " + e.getMessage());
                refused = true;
            } catch (IllegalArgumentException e) {
                out.println(file + ": " + e.getMessage());
                out.println(file + ": refused");
                refused = true;
            }
        }
        out.flush();
        return refused ? 2 : 0;
    }

    /** @return false when the file cannot be checked here */
    private boolean check(Path file, PrintWriter out) throws IOException {
        Map<String, String> top = topKeys(file);
        boolean isScenario = top.containsKey("durationS") || top.containsKey("events") || top.containsKey("site");
        if (top.containsKey("areas") || top.containsKey("siteId") && !isScenario) {
            List<String> warnings = new ArrayList<>();
            Grid grid = SiteLoader.loadForRun(file, warnings::add);
            warnings.forEach(out::println);
            sitesWarned.add(file.toAbsolutePath().normalize());
            String stability = SmallSignalStability.assess(grid).describe();
            // a lightly damped site was warned about on the line above: not a second time on the ok line
            out.println(file + ": site " + grid.siteId() + " ok; " + (warnings.stream().anyMatch(w -> w.contains(stability))
                    ? "stability warning above" : stability));
            return true;
        }
        if (isScenario) {
            OldKeys.SCENARIO.warn(file, out::println);
            String siteId = top.getOrDefault("siteId", top.get("site"));
            if (site == null && siteId == null) {
                out.println(file + ":1:1: the scenario names no site (top-level siteId:); give --site FILE");
                return false;
            }
            Path siteFile = site != null ? site : org.loopstand.protocol.config.InstallFolder.fromEnvironment().siteFor(file, siteId);
            // its site's warnings once per run of check, even when the site was given as a file of its own too
            boolean warned = !sitesWarned.add(siteFile.toAbsolutePath().normalize());
            Grid grid = SiteLoader.loadForRun(siteFile, warned ? w -> { } : out::println);
            HostLinks hosts = hostsFile == null ? HostLinks.NONE : NamespaceHostLinks.read(hostsFile);
            RunScenario scenario = RunScenarioLoader.load(file, EventTypeRegistry.physics(), grid, hosts);
            RunScenarioLoader.startWarnings(file, scenario, grid).forEach(out::println);
            out.println(file + ": scenario ok against " + siteFile + " (" + scenario.scenario().events().size()
                    + " events, " + scenario.faults().size() + " faults, " + scenario.checks().size() + " checks)");
            return true;
        }
        if (top.containsKey("settings") || top.containsKey("steps")) {
            out.println(file + ": looks like a unit test plan; plans are the controller's and are not checked here:"
                    + " ./loopstand pulse-test --plan FILE reads it and refuses it before any pulse is sent");
            return false;
        }
        out.println(file + ":1:1: neither a site (top-level siteId: and areas:) nor a scenario (top-level siteId: and durationS:)");
        return false;
    }

    /** @return the top-level keys and their plain values (a list or mapping value reads as "") */
    private static Map<String, String> topKeys(Path file) {
        Map<String, String> keys = new LinkedHashMap<>();
        if (YamlNode.read(file) instanceof YamlNode.Mapping m) {
            m.entries().keySet().forEach(k -> keys.put(k, m.text(k).orElse("")));
        }
        return keys;
    }
}
