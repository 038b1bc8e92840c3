package org.loopstand.app.campaign;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The same campaign file and master seed give the same runs; the runs themselves differ. */
class CampaignExpanderTest {
    static final String BODY = """
            runs: 12
            masterSeed: %d
            faultsPerRun: {min: 0, max: 3}
            faults:
              - type: commandDrop
                targets: [ridge-hydro-1, ridge-steam-1, basin-steam-1]
                startS: {min: 0, max: 60}
                durationS: {min: 10, max: 80}
                parameters:
                  dropProbability: {min: 0.2, max: 1}
              - type: bias
                weight: 3
                targets: [south-ridge]
                startS: {min: 0, max: 60}
                durationS: 30
                parameters:
                  point: [frequency, basin-ridge]
                  offsetMw: [-10, 10]
            loadEventsPerRun: {min: 0, max: 1}
            loadEvents:
              - {type: loadStep, areas: [north-basin, south-ridge], atS: {min: 5, max: 100}, deltaMw: {min: -30, max: 30}}
            """;

    @TempDir
    Path dir;

    private List<RunPlan> expand(long masterSeed, int runs) throws Exception {
        CampaignSpec spec = CampaignReader.read(CampaignFiles.campaign(dir, "c" + masterSeed + ".yaml", BODY.formatted(masterSeed)), dir);
        return CampaignExpander.of(spec.withRuns(runs)).expand();
    }

    @Test
    void shouldExpandTheSameMasterSeedIntoTheSameRunsAndAnotherIntoOthers() throws Exception {
        List<RunPlan> first = expand(42, 40);
        List<RunPlan> again = expand(42, 40);
        List<RunPlan> shorter = expand(42, 5);
        List<RunPlan> other = expand(43, 40);

        assertThat(again).isEqualTo(first);
        // run i does not depend on how many runs the campaign has
        assertThat(shorter).isEqualTo(first.subList(0, 5));
        assertThat(other).isNotEqualTo(first);
        assertThat(first).extracting(RunPlan::seed).doesNotHaveDuplicates();
        assertThat(first.get(0).seed()).isEqualTo(CampaignExpander.runSeed(42, 1));
        // the draws reach every part of a plan: counts from 0 to 3 faults, both kinds, load events or none
        assertThat(first).extracting(p -> p.faults().size()).contains(0, 1, 2, 3);
        assertThat(first).flatExtracting(RunPlan::faults).extracting(RunPlan.PlannedFault::type).contains("commandDrop", "bias");
        assertThat(first).extracting(p -> p.loads().size()).contains(0, 1);
    }

    @Test
    void shouldKeepTheBaseScenariosSeedInEveryRunWhenTheCampaignSaysSo() throws Exception {
        CampaignSpec spec = CampaignReader.read(CampaignFiles.campaign(dir, "base.yaml", "scenarioSeed: base\n" + BODY.formatted(42)), dir);
        List<RunPlan> plans = CampaignExpander.of(spec).expand();

        // short.yaml's seed: 5; the draws still follow the master seed
        assertThat(plans).extracting(RunPlan::seed).containsOnly(5L);
        assertThat(plans).extracting(RunPlan::faults).isEqualTo(expand(42, 12).stream().map(RunPlan::faults).toList());
    }

    @Test
    void shouldDrawWithinTheDistributionsAndNeverAContradictingPair() throws Exception {
        List<RunPlan> plans = expand(7, 12);

        for (RunPlan p : plans) {
            for (RunPlan.PlannedFault f : p.faults()) {
                assertThat(f.startS()).isBetween(0.0, 60.0);
                assertThat(f.endS()).isLessThanOrEqualTo(150.0);
                if (f.type().equals("commandDrop")) {
                    assertThat(f.lengthS()).isBetween(10.0 - 1e-9, 80.0 + 1e-9);
                    assertThat((Double) f.parameters().get("dropProbability")).isBetween(0.2, 1.0);
                } else {
                    assertThat(f.parameters().get("point")).isIn("frequency", "basin-ridge");
                    assertThat(f.parameters().get("offsetMw")).isIn(-10.0, 10.0);
                }
            }
            // the same kind on the same target never overlaps (the scenario loader would refuse the run)
            for (int i = 0; i < p.faults().size(); i++) {
                for (int j = 0; j < i; j++) {
                    RunPlan.PlannedFault a = p.faults().get(i);
                    RunPlan.PlannedFault b = p.faults().get(j);
                    boolean clash = a.type().equals(b.type()) && a.target().equals(b.target())
                            && a.startS() < b.endS() && b.startS() < a.endS()
                            && java.util.Objects.equals(a.parameters().get("point"), b.parameters().get("point"));
                    assertThat(clash).as(p.describe().toString()).isFalse();
                }
            }
        }
    }
}
