package org.loopstand.controller.pulsetest.governor;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.loopstand.controller.following.GovernorResponse;

/**
 * What the tested unit's own governor does with frequency, from the site file: the part of its output
 * that is the grid's answer, not the unit's answer to the test's pulses.
 *
 * <p>Static answer: −gainMwPerHz × (deviation beyond the dead band), gainMwPerHz = rating / (droop/100)
 * / nominal frequency. It reaches the output through the turbine: a share {@code fastShare} through one
 * lag of {@code fastLagS}, the rest through that lag and a further {@code slowLagS} (a reheat turbine's
 * high-pressure part and reheater; a turbine without a reheater has fastShare 1).
 *
 * @param area        the unit's area id (whose meter gives the frequency)
 * @param nominalHz   the area's nominal frequency, Hz, &gt; 0
 * @param gainMwPerHz governor gain, MW/Hz, ≥ 0 (0 = no governor answer)
 * @param deadBandHz  half-width of the dead band, Hz, ≥ 0 (deviation minus dead band acts)
 * @param fastShare   share of the answer through the fast path, in [0, 1]
 * @param fastLagS    governor and first turbine lag, s, ≥ 0
 * @param slowLagS    further lag of the rest (reheater), s, ≥ 0
 */
public record GovernorSpec(String area, double nominalHz, double gainMwPerHz, double deadBandHz, double fastShare,
        double fastLagS, double slowLagS) {
    public GovernorSpec {
        Objects.requireNonNull(area, "area");
        List<String> problems = new ArrayList<>();
        if (!(nominalHz > 0) || !Double.isFinite(nominalHz)) {
            problems.add("nominal frequency must be > 0 Hz, got " + nominalHz);
        }
        if (!(gainMwPerHz >= 0) || !Double.isFinite(gainMwPerHz)) {
            problems.add("governor gain must be finite and ≥ 0 MW/Hz, got " + gainMwPerHz);
        }
        if (!(deadBandHz >= 0) || !Double.isFinite(deadBandHz)) {
            problems.add("dead band must be finite and ≥ 0 Hz, got " + deadBandHz);
        }
        if (!(fastShare >= 0 && fastShare <= 1)) {
            problems.add("fast share must lie in [0, 1], got " + fastShare);
        }
        if (!(fastLagS >= 0) || !(slowLagS >= 0) || !Double.isFinite(fastLagS) || !Double.isFinite(slowLagS)) {
            problems.add("lags must be finite and ≥ 0 s, got " + fastLagS + " and " + slowLagS);
        }
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("governor of a unit in area " + area + ": " + String.join("; ", problems));
        }
    }

    /** @return the governor's steady answer to a frequency, MW (negative above nominal) */
    public double staticAnswerMw(double frequencyHz) {
        return new GovernorResponse(gainMwPerHz, deadBandHz).shareMw(frequencyHz - nominalHz);
    }
}
