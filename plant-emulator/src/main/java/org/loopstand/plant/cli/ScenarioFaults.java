package org.loopstand.plant.cli;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLog;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.protocol.time.Clock;

/**
 * The fault windows of a real-time plant: the scenario's faults scheduled on one {@link FaultEngine}
 * (live fault orders join them from the faults topic), told to the log, the run record, the terminal,
 * the journal and the metrics counters, and wired into the plant's stages.
 */
final class ScenarioFaults {
    private ScenarioFaults() {
    }

    /**
     * @param rehearsal the scenario's faults, or null without a rehearsal scenario
     * @param journal   the run journal, may be null
     * @param seed      seeds the fault stages' random draws
     * @param hostLinks what network faults act on ({@link HostLinks#NONE} without a hosts file)
     */
    static FaultHooks wire(PlantRunner runner, RunScenario rehearsal, RunRecord record, PlantRunJournal journal, Clock clock,
            long seed, HostLinks hostLinks) {
        List<FaultObserver> observers = new ArrayList<>(List.of(new FaultLog(), record, new FaultAnnouncer(PlantCommand::say)));
        if (journal != null) {
            observers.add(journal);
        }
        observers.add(runner.counters()); // the metrics page counts what the fault stage kept off the wire
        FaultObserver observer = FaultObserver.all(observers);
        FaultEngine faults = new FaultEngine(clock, clock.epochMillis(), observer);
        faults.useHostLinks(hostLinks);
        if (rehearsal != null) {
            for (var f : rehearsal.faults()) {
                faults.schedule(f).ifPresent(why -> PlantCommand.say("plant: fault " + f.id() + " not scheduled: " + why));
            }
        }
        return FaultHooks.wire(runner, faults, observer, record, clock, seed, true);
    }
}
