package org.loopstand.plant.runtime;

import java.util.List;
import java.util.Map;
import java.util.function.Consumer;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.engine.ScenarioEngine;
import org.loopstand.plant.journal.PlantRunJournal;

/**
 * The scenario's checks in a real-time run: decided by the {@link ScenarioEngine} over its run
 * record when the scenario ran to its end, each told to a sink as one line and journaled as a
 * {@code check} entry; a run stopped early decides none and says so, on the sink and in the journal
 * ({@code checksNotDecided}, reason {@code stoppedBeforeEnd}).
 */
final class PlantCheckVerdicts {
    private final List<CheckSpec> checks;
    private final Consumer<String> sink;

    PlantCheckVerdicts(List<CheckSpec> checks, Consumer<String> sink) {
        this.checks = List.copyOf(checks);
        this.sink = sink;
    }

    /**
     * @param epochMs scenario epoch ms of the run's end
     * @param journal where each verdict is journaled, may be null
     */
    void decide(ScenarioEngine engine, long epochMs, PlantRunJournal journal) {
        if (checks.isEmpty()) {
            return;
        }
        if (!engine.ended()) {
            double stoppedAtS = engine.grid().timeS();
            sink.accept("plant: scenario checks not decided: the run stopped at " + stoppedAtS + " s, before its end");
            if (journal != null) { // a reader of the journal alone must see why no verdict follows
                journal.event(epochMs, Map.of("event", "checksNotDecided", "reason", "stoppedBeforeEnd", "stoppedAtS",
                        stoppedAtS, "checks", checks.stream().map(CheckSpec::name).toList()));
            }
            return;
        }
        for (CheckOutcome o : engine.decideChecks(checks)) {
            sink.accept("plant: check " + o);
            if (journal != null) {
                journal.check(epochMs, o);
            }
        }
    }
}
