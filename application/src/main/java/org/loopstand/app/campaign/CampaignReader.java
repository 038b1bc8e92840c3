package org.loopstand.app.campaign;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.FaultType;
import org.loopstand.plant.fault.ParameterSpec;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.InstallFolder;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.config.SourceLocation;
import org.loopstand.protocol.config.YamlNode;

/**
 * Reads a campaign file (docs/campaigns.md) and checks it against its site, its base scenario and the
 * fault library before any run starts. Every problem is reported at once as {@code file:line:column: what}
 * ({@link ConfigFileException}): unknown keys, fault kinds, targets and parameters, empty distributions,
 * contradictory ones (min above max) and windows that would end past the base scenario's end.
 */
public final class CampaignReader {
    private static final Set<String> LOAD_EVENT_TYPES = Set.of("loadStep", "loadRamp");

    private final FaultLibrary library = FaultLibrary.standard();
    private final List<String> problems = new ArrayList<>();
    private final Path home;

    private CampaignReader(Path home) {
        this.home = home;
    }

    /**
     * @param file the campaign file; {@code scenario} and {@code siteFile} in it are relative to its folder
     * @param home the install folder: a site named only by id is looked for as {@link InstallFolder#siteFor} does
     * @throws ConfigFileException listing every problem of the campaign (or of its site or base scenario)
     */
    public static CampaignSpec read(Path file, Path home) throws IOException {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return new CampaignReader(home).read(file, YamlNode.read(file.toString(), r));
        }
    }

    private CampaignSpec read(Path file, YamlNode root) throws IOException {
        MappingReader top = new MappingReader(root, "campaign", problems);
        Path dir = file.toAbsolutePath().getParent();
        String siteId = top.requiredString("siteId");
        String siteFileText = top.optionalString("siteFile", null);
        String scenarioText = top.requiredString("scenario");
        long runs = top.optionalLong("runs", 100);
        if (runs < 1 || runs > 1_000_000) {
            top.fail("runs", "must lie in [1, 1000000], got " + runs);
        }
        if (!top.has("masterSeed")) {
            top.requiredDouble("masterSeed");
        }
        long masterSeed = top.optionalLong("masterSeed", 0);
        String scenarioSeed = top.optionalString("scenarioSeed", "perRun");
        if (!List.of("perRun", "base").contains(scenarioSeed)) {
            top.fail("scenarioSeed", "must be perRun or base, got '" + scenarioSeed + "'");
        }
        CampaignSpec.IntRange faultsPerRun = intRange(top, "faultsPerRun", new CampaignSpec.IntRange(1, 2));
        CampaignSpec.IntRange loadEventsPerRun = intRange(top, "loadEventsPerRun", new CampaignSpec.IntRange(0, 0));
        CampaignSpec.Shrink shrink = shrink(top);
        List<YamlNode> faultNodes = top.sequence("faults", false);
        List<YamlNode> loadNodes = top.sequence("loadEvents", false);
        top.finish();
        if (faultsPerRun.max() > 0 && faultNodes.isEmpty()) {
            problems.add(top.locationOf("faults") + ": faults of campaign is empty (or missing) but faultsPerRun allows up to "
                    + faultsPerRun.max() + " faults per run; name at least one fault kind");
        }
        if (loadEventsPerRun.max() > 0 && loadNodes.isEmpty()) {
            problems.add(top.locationOf("loadEvents") + ": loadEvents of campaign is empty (or missing) but loadEventsPerRun allows up to "
                    + loadEventsPerRun.max());
        }
        if (siteId == null || scenarioText == null) {
            throw new ConfigFileException(problems);
        }
        InstallFolder install = InstallFolder.of(Map.of(InstallFolder.HOME_VARIABLE, home.toString()));
        Path siteFile = siteFileText != null ? dir.resolve(siteFileText).normalize() : install.findSite(file, siteId).orElse(null);
        Path scenarioFile = dir.resolve(scenarioText).normalize();
        if (siteFile == null) {
            problems.add(top.locationOf("siteId") + ": " + install.noSite(file, siteId) + "; give siteFile");
        } else if (!Files.isRegularFile(siteFile)) {
            problems.add(top.locationOf("siteFile") + ": site file " + siteFile + " does not exist");
        }
        if (!Files.isRegularFile(scenarioFile)) {
            problems.add(top.locationOf("scenario") + ": scenario file " + scenarioFile + " does not exist");
        }
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
        Grid grid = SiteLoader.loadForRun(siteFile, w -> { });
        if (!grid.siteId().equals(siteId)) {
            problems.add(top.locationOf("siteId") + ": site '" + siteId + "' but " + siteFile + " is site '" + grid.siteId() + "'");
        }
        RunScenario base = RunScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid);
        if (!base.scenario().siteId().equals(grid.siteId())) {
            problems.add(top.locationOf("scenario") + ": scenario " + scenarioFile + " is written for site '"
                    + base.scenario().siteId() + "', not '" + grid.siteId() + "'");
        }
        double durationS = base.scenario().durationS();
        TargetCatalog catalog = TargetCatalog.of(grid);
        List<CampaignSpec.FaultDraw> faults = new ArrayList<>();
        for (YamlNode n : faultNodes) {
            FaultDrawReader.read(n, library, catalog, durationS, problems).ifPresent(faults::add);
        }
        List<CampaignSpec.LoadEventDraw> loads = new ArrayList<>();
        for (YamlNode n : loadNodes) {
            loadEvent(n, catalog, durationS, loads);
        }
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
        String name = file.getFileName().toString().replaceFirst("\\.ya?ml$", "");
        return new CampaignSpec(name, file, siteFile, scenarioFile, durationS, (int) runs, masterSeed, "perRun".equals(scenarioSeed),
                faultsPerRun, faults, loadEventsPerRun, loads, shrink);
    }

    private CampaignSpec.IntRange intRange(MappingReader top, String key, CampaignSpec.IntRange fallback) {
        YamlNode node = top.node(key).orElse(null);
        if (node == null) {
            return fallback;
        }
        Distribution d = Distributions.numbers(node, key + " of campaign", problems);
        if (d == null) {
            return fallback;
        }
        if (d.min() != Math.rint(d.min()) || d.max() != Math.rint(d.max()) || d.min() < 0 || d.max() > 100) {
            problems.add(node.location() + ": " + key + " of campaign must be whole numbers in [0, 100], got " + d.describe());
            return fallback;
        }
        return new CampaignSpec.IntRange((int) d.min(), (int) d.max());
    }

    private CampaignSpec.Shrink shrink(MappingReader top) {
        CampaignSpec.Shrink fallback = new CampaignSpec.Shrink(5, 24, 10);
        YamlNode node = top.node("shrink").orElse(null);
        if (node == null) {
            return fallback;
        }
        MappingReader r = new MappingReader(node, "shrink", problems);
        long maxRuns = r.optionalLong("maxRuns", fallback.maxRuns());
        long maxSteps = r.optionalLong("maxSteps", fallback.maxSteps());
        double minWindowS = r.optionalDouble("minWindowS", fallback.minWindowS());
        r.finish();
        if (maxRuns < 0 || maxRuns > 1000) {
            r.fail("maxRuns", "must lie in [0, 1000], got " + maxRuns);
        }
        if (maxSteps < 0 || maxSteps > 1000) {
            r.fail("maxSteps", "must lie in [0, 1000], got " + maxSteps);
        }
        if (!(minWindowS > 0)) {
            r.fail("minWindowS", "must be above 0 s, got " + minWindowS);
        }
        return new CampaignSpec.Shrink((int) maxRuns, (int) maxSteps, minWindowS);
    }

    private void loadEvent(YamlNode n, TargetCatalog catalog, double durationS, List<CampaignSpec.LoadEventDraw> out) {
        MappingReader r = new MappingReader(n, "load event", problems);
        String type = r.requiredString("type");
        double weight = r.optionalDouble("weight", 1.0);
        List<String> areas = Distributions.ids(r, "areas", problems);
        Distribution atS = Distributions.required(r, "atS", problems);
        Distribution deltaMw = Distributions.required(r, "deltaMw", problems);
        Distribution rampS = "loadRamp".equals(type) ? Distributions.required(r, "durationS", problems) : null;
        r.finish();
        if (type != null && !LOAD_EVENT_TYPES.contains(type)) {
            problems.add(r.locationOf("type") + ": unknown load event type '" + type + "'; known: " + LOAD_EVENT_TYPES);
            return;
        }
        if (!(weight > 0)) {
            r.fail("weight", "must be above 0, got " + weight);
        }
        for (String a : areas) {
            if (!catalog.areas().contains(a)) {
                problems.add(r.locationOf("areas") + ": load event: unknown area '" + a + "' (site " + catalog.siteId()
                        + " has " + catalog.areas() + ")");
            }
        }
        if (atS != null && (atS.min() < 0 || atS.max() >= durationS)) {
            problems.add(r.locationOf("atS") + ": load event: atS " + atS.describe() + " must lie in [0, " + Distribution.format(durationS)
                    + ") s (the base scenario's duration)");
        }
        if (rampS != null && rampS.min() < 0) {
            problems.add(r.locationOf("durationS") + ": load event: durationS " + rampS.describe() + " must be 0 s or more");
        }
        if (type != null && atS != null && deltaMw != null && !areas.isEmpty() && ("loadStep".equals(type) || rampS != null)) {
            out.add(new CampaignSpec.LoadEventDraw(type, weight, areas, atS, deltaMw, rampS));
        }
    }

    /** Reads one entry of {@code faults:}. */
    static final class FaultDrawReader {
        private FaultDrawReader() {
        }

        static java.util.Optional<CampaignSpec.FaultDraw> read(YamlNode n, FaultLibrary library, TargetCatalog catalog,
                double durationS, List<String> problems) {
            int before = problems.size();
            MappingReader r = new MappingReader(n, "fault", problems);
            String typeName = r.requiredString("type");
            double weight = r.optionalDouble("weight", 1.0);
            List<String> targets = Distributions.ids(r, "targets", problems);
            Distribution startS = Distributions.required(r, "startS", problems);
            Distribution lengthS = Distributions.required(r, "durationS", problems);
            Map<String, YamlNode.Entry> paramNodes = new LinkedHashMap<>();
            r.node("parameters").ifPresent(p -> {
                if (p instanceof YamlNode.Mapping m) {
                    paramNodes.putAll(m.entries());
                } else {
                    problems.add(p.location() + ": parameters of fault must be a mapping of name: distribution");
                }
            });
            r.finish();
            if (!(weight > 0)) {
                r.fail("weight", "must be above 0, got " + weight);
            }
            FaultType type = typeName == null ? null : library.type(typeName).orElse(null);
            if (typeName != null && type == null) {
                problems.add(r.locationOf("type") + ": unknown fault type '" + typeName + "'; known types: " + library.names());
                return java.util.Optional.empty();
            }
            if (startS != null && startS.min() < 0) {
                problems.add(r.locationOf("startS") + ": fault " + typeName + ": startS " + startS.describe() + " must be 0 s or more");
            }
            if (lengthS != null && !(lengthS.min() > 0)) {
                problems.add(r.locationOf("durationS") + ": fault " + typeName + ": durationS " + lengthS.describe() + " must be above 0 s");
            }
            if (startS != null && lengthS != null && startS.max() + lengthS.max() > durationS) {
                problems.add(r.locationOf("durationS") + ": fault " + typeName + ": a window can end at " + Distribution.format(startS.max()
                        + lengthS.max()) + " s (largest startS + largest durationS), past the base scenario's end (" + Distribution.format(durationS) + " s)");
            }
            Map<String, Distribution> params = new LinkedHashMap<>();
            if (type != null) {
                for (String t : targets) {
                    TargetCatalog.Resolution res = catalog.resolve(t, type.targetKinds());
                    if (res.problem() != null) {
                        problems.add(r.locationOf("targets") + ": fault " + type.name() + ": " + res.problem());
                    }
                }
                parameters(type, paramNodes, problems, params);
                if (problems.size() == before) {
                    probe(type, targets, params, catalog, r.locationOf("targets"), problems);
                }
            }
            if (problems.size() > before || type == null || startS == null || lengthS == null) {
                return java.util.Optional.empty();
            }
            return java.util.Optional.of(new CampaignSpec.FaultDraw(typeName, weight, targets, startS, lengthS, params,
                    r.location().line()));
        }

        private static void parameters(FaultType type, Map<String, YamlNode.Entry> nodes, List<String> problems,
                Map<String, Distribution> out) {
            for (Map.Entry<String, YamlNode.Entry> e : nodes.entrySet()) {
                SourceLocation at = e.getValue().keyLocation();
                ParameterSpec p = type.parameter(e.getKey()).orElse(null);
                if (p == null) {
                    problems.add(at + ": fault type " + type.name() + " has no parameter '" + e.getKey() + "'; it takes "
                            + type.parameters().stream().map(ParameterSpec::name).toList());
                    continue;
                }
                Distribution d = p.text() ? Distributions.texts(e.getValue().value(), e.getKey(), problems)
                        : Distributions.numbers(e.getValue().value(), e.getKey(), problems);
                if (d == null) {
                    continue;
                }
                for (Object v : extremes(d)) {
                    p.check(v).ifPresent(why -> problems.add(at + ": fault " + type.name() + ": " + why));
                }
                out.put(e.getKey(), d);
            }
        }

        private static List<Object> extremes(Distribution d) {
            return d instanceof Distribution.OneOf o && o.texts() ? List.copyOf(o.values()) : List.of(d.min(), d.max());
        }

        /** Builds the fault once per target and text value, as the scenario loader will, so that what it refuses is refused here. */
        private static void probe(FaultType type, List<String> targets, Map<String, Distribution> params, TargetCatalog catalog,
                SourceLocation at, List<String> problems) {
            Set<String> seen = new LinkedHashSet<>();
            for (String target : targets) {
                List<Map<String, Object>> variants = new ArrayList<>();
                Map<String, Object> first = new LinkedHashMap<>();
                params.forEach((k, d) -> first.put(k, extremes(d).get(0)));
                variants.add(first);
                params.forEach((k, d) -> extremes(d).forEach(v -> {
                    Map<String, Object> m = new LinkedHashMap<>(first);
                    m.put(k, v);
                    variants.add(m);
                }));
                for (Map<String, Object> v : variants) {
                    for (FaultSpec.Problem p : FaultSpec.builder(FaultLibrary.standard(), catalog).id("probe").type(type.name())
                            .target(target).parameters(v).window(0, 1).problems()) {
                        seen.add(at + ": fault " + type.name() + " on " + target + ": " + p.message());
                    }
                }
            }
            problems.addAll(seen);
        }
    }
}
