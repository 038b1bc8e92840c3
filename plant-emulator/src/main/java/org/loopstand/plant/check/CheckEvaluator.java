package org.loopstand.plant.check;

import org.loopstand.plant.grid.Grid;

/** Decides one check from a run record. */
@FunctionalInterface
public interface CheckEvaluator {
    CheckOutcome evaluate(CheckSpec spec, RunRecord run, Grid grid);
}
