package org.loopstand.app.campaign;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

/**
 * A campaign file, read and checked against its site and base scenario ({@link CampaignReader}).
 *
 * @param name             the campaign's name (its file name without .yaml)
 * @param file             the campaign file
 * @param siteFile         the site the runs use
 * @param scenarioFile     the base scenario: its events, faults and checks are in every run
 * @param baseDurationS    the base scenario's duration, s
 * @param runs             how many runs, ≥ 1
 * @param masterSeed       every run's draws are seeded from it ({@link CampaignExpander#runSeed})
 * @param seedPerRun       true: each run's scenario gets its draw seed as random seed (load noise differs from run to
 *                         run); false: every run keeps the base scenario's seed, so only the drawn faults differ
 * @param faultsPerRun     how many faults each run draws, [min, max], 0 ≤ min ≤ max
 * @param faults           the fault kinds to draw from, at least one when faultsPerRun max &gt; 0
 * @param loadEventsPerRun how many load events each run draws, [min, max]
 * @param loadEvents       the load events to draw from
 * @param shrink           bounds of the shrinking of failing runs
 */
public record CampaignSpec(String name, Path file, Path siteFile, Path scenarioFile, double baseDurationS, int runs,
                           long masterSeed, boolean seedPerRun, IntRange faultsPerRun, List<FaultDraw> faults, IntRange loadEventsPerRun,
                           List<LoadEventDraw> loadEvents, Shrink shrink) {
    public CampaignSpec {
        faults = List.copyOf(faults);
        loadEvents = List.copyOf(loadEvents);
    }

    /** @return the same campaign with another run count */
    public CampaignSpec withRuns(int n) {
        return new CampaignSpec(name, file, siteFile, scenarioFile, baseDurationS, n, masterSeed, seedPerRun, faultsPerRun, faults,
                loadEventsPerRun, loadEvents, shrink);
    }

    /** Whole numbers from min to max, both included. */
    public record IntRange(int min, int max) {
    }

    /**
     * One fault kind a run may draw.
     *
     * @param type       a fault type of the fault library
     * @param weight     relative chance of this entry, &gt; 0
     * @param targets    the ids one is drawn from (each known to the site for this type)
     * @param startS     window start, scenario s
     * @param durationS  window length, s
     * @param parameters the type's parameters, each drawn from its distribution (absent ones take the type's default)
     * @param line       where the entry is written, for reports
     */
    public record FaultDraw(String type, double weight, List<String> targets, Distribution startS, Distribution durationS,
                            Map<String, Distribution> parameters, int line) {
        public FaultDraw {
            targets = List.copyOf(targets);
            parameters = Map.copyOf(parameters);
        }
    }

    /**
     * One load event a run may draw: a loadStep or a loadRamp.
     *
     * @param type      loadStep or loadRamp
     * @param weight    relative chance, &gt; 0
     * @param areas     the areas one is drawn from
     * @param atS       when, scenario s
     * @param deltaMw   load change, MW (+ = more load)
     * @param durationS ramp length, s (loadRamp only, null for loadStep)
     */
    public record LoadEventDraw(String type, double weight, List<String> areas, Distribution atS, Distribution deltaMw,
                                Distribution durationS) {
        public LoadEventDraw {
            areas = List.copyOf(areas);
        }
    }

    /**
     * @param maxRuns    failing runs shrunk, at most (the first ones in run order)
     * @param maxSteps   runs tried while shrinking one failing run, at most
     * @param minWindowS a window is not narrowed below this length, s
     */
    public record Shrink(int maxRuns, int maxSteps, double minWindowS) {
    }
}
