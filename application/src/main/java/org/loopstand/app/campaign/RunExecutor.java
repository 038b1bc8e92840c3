package org.loopstand.app.campaign;

import java.nio.file.Path;
import java.util.List;

import org.loopstand.app.lockstep.LockstepRehearsal;
import org.loopstand.plant.check.CheckOutcome;

/** Runs one scenario file closed loop and gives its checks; campaigns use {@link #LOCKSTEP}. */
@FunctionalInterface
public interface RunExecutor {
    /** The built-in controller and the plant in lockstep, without journals ({@link LockstepRehearsal#checksOnly()}). */
    RunExecutor LOCKSTEP = (site, scenario) -> new LockstepRehearsal(site, scenario, null).checksOnly();

    /**
     * @return the scenario's checks as decided at its end
     * @throws Exception anything the run throws; the campaign records it as an error of that run and goes on
     */
    List<CheckOutcome> checks(Path siteFile, Path scenarioFile) throws Exception;
}
