package org.loopstand.controller.regulation;

/**
 * Output of one regulation step of an area.
 *
 * @param filteredAceMw filtered ACE, MW
 * @param band          band of the filtered ACE
 * @param levelMw       area regulation level, MW above the sum of base points (+ = raise)
 * @param changeMw      levelMw minus the previous level, MW (0 in the quiet band)
 * @param saturated     the level is at the units' available limit
 */
public record RegulationResult(double filteredAceMw, AceBand band, double levelMw, double changeMw,
                               boolean saturated) {
}
