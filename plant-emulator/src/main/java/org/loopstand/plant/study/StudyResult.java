package org.loopstand.plant.study;

import java.util.Map;

/**
 * What a study run ended with. Maps keep site order.
 *
 * @param settled          whether the run ended settled, by {@code settledCriterion}
 * @param settledCriterion the rule applied, in words with its bands and window
 * @param areas  per area: finalFrequencyHz, minFrequencyHz, maxFrequencyHz, initialImbalanceMw
 * @param ties   per tie: finalFlowMw
 * @param units  per unit: finalOutputMw
 */
public record StudyResult(String siteId, long seed, double stepS, double simulatedSeconds, int eventsApplied,
                          boolean settled, String settledCriterion,
                          Map<String, Map<String, Double>> areas, Map<String, Map<String, Double>> ties,
                          Map<String, Map<String, Double>> units, double wallSeconds) {
}
