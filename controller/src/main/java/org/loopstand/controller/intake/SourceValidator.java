package org.loopstand.controller.intake;

import org.loopstand.controller.config.InputValidationSettings;

import java.util.EnumSet;
import java.util.Set;

/**
 * Checks the samples of one source (one meter's value) and says what its latest value is worth.
 * Samples go in through {@link #accept(MeasuredValue)} as they arrive; {@link #evaluate(long)} is
 * asked once per cycle. Not thread-safe: feed it from one thread (the cycle thread).
 *
 * <p>Per sample: sequence (duplicate and out-of-order samples are dropped, gaps noted), clock skew
 * ({@code sourceTime − receivedAt}; ahead beyond the limit = not used, behind = noted), quality,
 * range, rate of change against the previous accepted sample (a genuine step fails once, a
 * one-sample spike twice), frozen. Per evaluation: age of the latest sample.
 */
public final class SourceValidator {
    private static final Set<ValidationReason> BLOCKING = EnumSet.of(ValidationReason.BAD_QUALITY,
            ValidationReason.OUT_OF_RANGE, ValidationReason.RATE_OF_CHANGE, ValidationReason.FROZEN,
            ValidationReason.CLOCK_SKEW_AHEAD);

    private final InputValidationSettings settings;
    private final SeqTracker seq = new SeqTracker();
    private final FrozenDetector frozen;
    private long clockSkewLimitMs;
    private MeasuredValue latest;
    private EnumSet<ValidationReason> latestReasons = EnumSet.noneOf(ValidationReason.class);
    private MeasuredValue lastGood;
    private long lastClockSkewMs;
    private long maxClockSkewAheadMs;
    private long maxClockSkewBehindMs;

    public SourceValidator(InputValidationSettings settings) {
        this.settings = settings;
        this.clockSkewLimitMs = settings.clockSkewLimitMs();
        this.frozen = new FrozenDetector(settings.frozenAfterMs(), settings.frozenMinReadings(),
                settings.frozenEpsilon());
    }

    /** @return the reasons found for this sample (empty = clean) */
    public Set<ValidationReason> accept(MeasuredValue sample) {
        EnumSet<ValidationReason> r = EnumSet.noneOf(ValidationReason.class);
        SeqTracker.Outcome o = seq.accept(sample.seq());
        if (o == SeqTracker.Outcome.DUPLICATE) {
            r.add(ValidationReason.DUPLICATE);
            return r;
        }
        if (o == SeqTracker.Outcome.OUT_OF_ORDER) {
            r.add(ValidationReason.OUT_OF_ORDER);
            return r;
        }
        if (o == SeqTracker.Outcome.GAP) {
            r.add(ValidationReason.SEQ_GAP);
        }
        long skew = sample.sourceTimeMs() - sample.receivedAtMs();
        lastClockSkewMs = skew;
        if (skew > clockSkewLimitMs) {
            r.add(ValidationReason.CLOCK_SKEW_AHEAD);
            maxClockSkewAheadMs = Math.max(maxClockSkewAheadMs, skew);
        } else if (skew < -clockSkewLimitMs) {
            r.add(ValidationReason.CLOCK_SKEW_BEHIND);
            maxClockSkewBehindMs = Math.max(maxClockSkewBehindMs, -skew);
        }
        if (!sample.qualityGood()) {
            r.add(ValidationReason.BAD_QUALITY);
        }
        double v = sample.value();
        if (!Double.isFinite(v) || v < settings.minValue() || v > settings.maxValue()) {
            r.add(ValidationReason.OUT_OF_RANGE);
        }
        if (latest != null && Double.isFinite(v) && Double.isFinite(latest.value())) {
            long dtMs = sample.sourceTimeMs() - latest.sourceTimeMs();
            double dv = Math.abs(v - latest.value());
            boolean rateCheckOn = settings.maxRatePerS() < Double.POSITIVE_INFINITY;
            // a changed value with no time between the samples is an infinite rate
            boolean tooFast = dtMs > 0 ? dv / (dtMs / 1000.0) > settings.maxRatePerS() : dv > 0;
            if (rateCheckOn && tooFast) {
                r.add(ValidationReason.RATE_OF_CHANGE);
            }
        }
        if (Double.isFinite(v) && frozen.accept(v, sample.sourceTimeMs())) {
            r.add(ValidationReason.FROZEN);
            // the samples of the run were the frozen value too: none of them may be held as good
            lastGood = null;
        }
        latest = sample;
        latestReasons = r;
        if (!blocking(r)) {
            lastGood = sample;
        }
        return EnumSet.copyOf(r);
    }

    /** @return the latest value judged at controller time {@code nowMs} (no fallback applied) */
    public ValidatedValue evaluate(long nowMs) {
        if (latest == null) {
            return ValidatedValue.unusable(EnumSet.of(ValidationReason.NO_DATA), Long.MAX_VALUE);
        }
        long ageMs = nowMs - latest.sourceTimeMs();
        EnumSet<ValidationReason> r = EnumSet.noneOf(ValidationReason.class);
        r.addAll(latestReasons);
        if (ageMs > settings.maxAgeMs()) {
            r.add(ValidationReason.STALE);
        }
        boolean usable = !blocking(r) && !r.contains(ValidationReason.STALE);
        return new ValidatedValue(usable ? latest.value() : Double.NaN, usable, r, false, ageMs);
    }

    /**
     * Clock skew is a matter of wall clocks: in a run replayed at {@code rate} scenario seconds per
     * wall second, a source whose time stamp is ahead of ours by the same wall time is {@code rate}
     * times further ahead in scenario ms (transport delay and the extrapolation of the plant's clock
     * grow the same way). The limit becomes {@code clockSkewLimitMs · max(1, rate)}.
     */
    public void scaleClockSkewLimit(double rate) {
        double factor = Double.isFinite(rate) ? Math.max(1.0, rate) : 1.0;
        clockSkewLimitMs = Math.round(settings.clockSkewLimitMs() * factor);
    }

    /** @return the clock skew limit in force, scenario ms */
    public long clockSkewLimitMs() {
        return clockSkewLimitMs;
    }

    /** @return the last sample that passed the per-sample checks, or null */
    public MeasuredValue lastGood() {
        return lastGood;
    }

    /** @return the latest sample as it arrived (whatever its checks said), or null before any */
    public MeasuredValue latest() { return latest; }
    /** @return samples in the present run of identical values (see {@link FrozenDetector}) */
    public int identicalRun() { return frozen.identicalRun(); }
    /** @return source-time span of the present run of identical values, ms */
    public long identicalSpanMs() { return frozen.identicalSpanMs(); }
    public InputValidationSettings settings() { return settings; }
    public SeqTracker seqTracker() { return seq; }
    /** @return source time − receipt time of the latest sample, ms (+ = source clock ahead) */
    public long lastClockSkewMs() { return lastClockSkewMs; }
    public long maxClockSkewAheadMs() { return maxClockSkewAheadMs; }
    public long maxClockSkewBehindMs() { return maxClockSkewBehindMs; }

    private static boolean blocking(Set<ValidationReason> r) {
        for (ValidationReason x : r) {
            if (BLOCKING.contains(x)) {
                return true;
            }
        }
        return false;
    }
}
