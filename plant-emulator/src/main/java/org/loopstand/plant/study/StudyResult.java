package org.loopstand.plant.study;

import java.util.Map;

/**
 * What a study run ended with. Maps keep site order.
 *
 * @param areas  per area: finalFrequencyHz, minFrequencyHz, maxFrequencyHz, initialImbalanceMw
 * @param ties   per tie: finalFlowMw
 * @param units  per unit: finalOutputMw
 */
public record StudyResult(String siteId, long seed, double stepS, double simulatedSeconds, int eventsApplied,
                          Map<String, Map<String, Double>> areas, Map<String, Map<String, Double>> ties,
                          Map<String, Map<String, Double>> units, double wallSeconds) {
}
