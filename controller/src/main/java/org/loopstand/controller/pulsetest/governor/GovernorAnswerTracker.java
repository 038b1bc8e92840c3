package org.loopstand.controller.pulsetest.governor;

/**
 * The tested unit's expected governor answer over time, fed with measured frequencies (held between
 * readings). Not thread-safe; times must not go backwards (an earlier time is treated as no time).
 */
public final class GovernorAnswerTracker {
    private final GovernorSpec spec;
    private double inputMw = Double.NaN;
    private double fastMw;
    private double slowMw;
    private long atMs;

    public GovernorAnswerTracker(GovernorSpec spec) {
        this.spec = spec;
    }

    /** Takes a frequency reading at {@code tMs}; the first one starts the lags in their steady state. */
    public void frequency(long tMs, double frequencyHz) {
        if (!Double.isFinite(frequencyHz)) {
            return;
        }
        double in = spec.staticAnswerMw(frequencyHz);
        if (Double.isNaN(inputMw)) {
            fastMw = in;
            slowMw = in;
            atMs = tMs;
        } else {
            advance(tMs);
        }
        inputMw = in;
    }

    /** @return the expected answer at {@code tMs}, MW; NaN before the first frequency reading */
    public double answerMwAt(long tMs) {
        if (Double.isNaN(inputMw)) {
            return Double.NaN;
        }
        advance(tMs);
        return spec.fastShare() * fastMw + (1 - spec.fastShare()) * slowMw;
    }

    private void advance(long tMs) {
        double dtS = Math.max(0, tMs - atMs) / 1000.0;
        atMs = Math.max(atMs, tMs);
        if (dtS == 0) {
            return;
        }
        // exact step of two first-order lags in series for an input held over dt
        double a = spec.fastLagS() > 0 ? Math.exp(-dtS / spec.fastLagS()) : 0;
        double fastBefore = fastMw;
        fastMw = inputMw + (fastBefore - inputMw) * a;
        if (spec.slowLagS() <= 0) {
            slowMw = fastMw;
            return;
        }
        double b = Math.exp(-dtS / spec.slowLagS());
        double tf = spec.fastLagS();
        double ts = spec.slowLagS();
        // slow' = (fast − slow)/ts with fast = u + (f0 − u) e^(−t/tf)
        double e0 = fastBefore - inputMw;
        double s0 = slowMw - inputMw;
        slowMw = Math.abs(tf - ts) < 1e-9
                ? inputMw + s0 * b + e0 * dtS / ts * b
                : inputMw + s0 * b + e0 * tf / (tf - ts) * (a - b);
    }
}
