package org.loopstand.app.campaign;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.TargetCatalog;

/**
 * Expands a campaign into its runs. Run i's draw seed comes from the master seed alone
 * ({@link #runSeed}), and everything drawn for run i comes from a generator seeded with it (and, unless the
 * campaign keeps the base scenario's seed, so does the run's load noise), so the same
 * campaign file gives the same runs on any machine and with any worker count, and run i is the same
 * whether the campaign has 10 runs or 1000.
 */
public final class CampaignExpander {
    /** Draws of one fault that would contradict an earlier one (same kind and target, overlapping) before it is left out. */
    static final int MAX_REDRAWS = 8;

    private final CampaignSpec spec;
    private final TargetCatalog catalog;
    private final List<FaultSpec> baseFaults;
    private final long baseSeed;

    /**
     * @param baseFaults the base scenario's own faults, which drawn ones must not contradict
     * @param baseSeed   the base scenario's random seed (every run's when the campaign keeps it)
     */
    public CampaignExpander(CampaignSpec spec, TargetCatalog catalog, List<FaultSpec> baseFaults, long baseSeed) {
        this.spec = spec;
        this.catalog = catalog;
        this.baseFaults = List.copyOf(baseFaults);
        this.baseSeed = baseSeed;
    }

    /** @return the expander of {@code spec}, with the target catalog of its site and its base scenario's faults */
    public static CampaignExpander of(CampaignSpec spec) throws java.io.IOException {
        org.loopstand.plant.grid.Grid grid = org.loopstand.plant.site.SiteLoader.loadForRun(spec.siteFile(), w -> { });
        var base = org.loopstand.plant.scenario.RunScenarioLoader.load(spec.scenarioFile(),
                org.loopstand.plant.scenario.EventTypeRegistry.physics(), grid);
        return new CampaignExpander(spec, TargetCatalog.of(grid), base.faults(), base.scenario().seed());
    }

    /** @return run i's random seed (i ≥ 1): a SplitMix64 mix of the master seed and i, 0 ≤ seed &lt; 2^63 */
    public static long runSeed(long masterSeed, int index) {
        long z = masterSeed + index * 0x9E3779B97F4A7C15L;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return (z ^ (z >>> 31)) & Long.MAX_VALUE;
    }

    public List<RunPlan> expand() {
        List<RunPlan> out = new ArrayList<>();
        for (int i = 1; i <= spec.runs(); i++) {
            out.add(plan(i));
        }
        return out;
    }

    /** @return run {@code index} (1-based) */
    public RunPlan plan(int index) {
        long drawSeed = runSeed(spec.masterSeed(), index);
        SplittableRandom random = new SplittableRandom(drawSeed);
        int faultCount = between(random, spec.faultsPerRun());
        List<RunPlan.PlannedFault> faults = new ArrayList<>();
        List<FaultSpec> placed = new ArrayList<>(baseFaults);
        for (int k = 1; k <= faultCount && !spec.faults().isEmpty(); k++) {
            for (int attempt = 0; attempt < MAX_REDRAWS; attempt++) {
                RunPlan.PlannedFault f = drawFault(random, "campaign-" + k);
                FaultSpec built = toSpec(f);
                if (placed.stream().noneMatch(built::contradicts)) {
                    faults.add(f);
                    placed.add(built);
                    break;
                }
            }
        }
        int loadCount = between(random, spec.loadEventsPerRun());
        List<RunPlan.PlannedLoad> loads = new ArrayList<>();
        for (int k = 0; k < loadCount && !spec.loadEvents().isEmpty(); k++) {
            CampaignSpec.LoadEventDraw d = pick(random, spec.loadEvents(), CampaignSpec.LoadEventDraw::weight);
            String area = d.areas().get(random.nextInt(d.areas().size()));
            double atS = (Double) d.atS().draw(random);
            double deltaMw = (Double) d.deltaMw().draw(random);
            double rampS = d.durationS() == null ? Double.NaN : (Double) d.durationS().draw(random);
            loads.add(new RunPlan.PlannedLoad(d.type(), area, atS, deltaMw, rampS));
        }
        return new RunPlan(index, spec.seedPerRun() ? drawSeed : baseSeed, faults, loads);
    }

    private RunPlan.PlannedFault drawFault(SplittableRandom random, String id) {
        CampaignSpec.FaultDraw d = pick(random, spec.faults(), CampaignSpec.FaultDraw::weight);
        String target = d.targets().get(random.nextInt(d.targets().size()));
        double startS = (Double) d.startS().draw(random);
        double lengthS = (Double) d.durationS().draw(random);
        Map<String, Object> params = new LinkedHashMap<>();
        // by name: the same draws in the same order every time (the spec keeps no file order)
        d.parameters().entrySet().stream().sorted(Map.Entry.comparingByKey())
                .forEach(e -> params.put(e.getKey(), e.getValue().draw(random)));
        double endS = Math.min(spec.baseDurationS(), Math.round((startS + lengthS) * 1000.0) / 1000.0);
        return new RunPlan.PlannedFault(id, d.type(), target, params, startS, endS);
    }

    /** @return the fault as the scenario loader builds it (validated by the campaign reader already) */
    FaultSpec toSpec(RunPlan.PlannedFault f) {
        return FaultSpec.builder(FaultLibrary.standard(), catalog).id(f.id()).type(f.type()).target(f.target())
                .parameters(f.parameters()).window(f.startS(), f.endS()).build();
    }

    private static int between(SplittableRandom random, CampaignSpec.IntRange range) {
        return range.min() + random.nextInt(range.max() - range.min() + 1);
    }

    private static <T> T pick(SplittableRandom random, List<T> items, java.util.function.ToDoubleFunction<T> weight) {
        double total = items.stream().mapToDouble(weight).sum();
        double x = random.nextDouble() * total;
        for (T t : items) {
            x -= weight.applyAsDouble(t);
            if (x < 0) {
                return t;
            }
        }
        return items.get(items.size() - 1);
    }
}
