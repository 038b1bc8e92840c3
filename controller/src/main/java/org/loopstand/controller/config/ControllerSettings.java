package org.loopstand.controller.config;

import org.loopstand.controller.ace.AceMode;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;

/**
 * The optional {@code controller:} section of a site file. Every setting, its unit and default is
 * listed in docs/controller.md ("Controller process settings").
 *
 * @param cycleMs                 control cycle, ms, in [1000, 10000], default 4000
 * @param aceMode                 ACE mode of every area, default TIE_LINE_BIAS
 * @param regulation              filter, PI, bands (its cycleS follows cycleMs)
 * @param pulses                  pulse sizing
 * @param interlock               suspension rules
 * @param following               unit-following check
 * @param commandSettleMs         see ControlCycleSettings, ms, default 500
 * @param redispatchPeriodMs      tertiary re-dispatch period, ms, 0 = off (default 0)
 * @param redispatchRampShare     share of a unit's ramp used for base point moves, (0, 1], default 0.5
 * @param frequency               validation rule of area frequencies
 * @param tieFlow                 validation rule of tie flows
 * @param unitTelemetryMaxAgeMs   unit telemetry older than this makes the unit ineligible, ms, default 10000
 * @param clockSkewLimitMs        |sourceTime − receipt time| beyond this is clock skew, ms, default 2000
 * @param intakeQueueCapacity     messages buffered between bus threads and the cycle, default 20000
 * @param scheduleFromSite        without a received schedule, use NIs = Σ scheduled tie flows of the
 *                                site file and Fs = f0 (default true); false: suspend until one arrives
 */
public record ControllerSettings(long cycleMs, AceMode aceMode, RegulationSettings regulation, PulseSettings pulses,
                                 InterlockSettings interlock, FollowingSettings following, long commandSettleMs,
                                 long redispatchPeriodMs, double redispatchRampShare, InputRule frequency,
                                 InputRule tieFlow, long unitTelemetryMaxAgeMs, long clockSkewLimitMs,
                                 int intakeQueueCapacity, boolean scheduleFromSite) {

    /** @return defaults for a site of nominal frequency {@code f0Hz} */
    public static ControllerSettings defaults(double f0Hz) {
        return new ControllerSettings(4000, AceMode.TIE_LINE_BIAS, RegulationSettings.builder().build(),
                PulseSettings.DEFAULTS, InterlockSettings.DEFAULTS, FollowingSettings.DEFAULTS, 500, 0, 0.5,
                defaultFrequencyRule(f0Hz), defaultTieRule(), 10_000, 2_000, 20_000, true);
    }

    /** Scenario time a frequency must stay identical to be frozen by default, ms (12 readings at a 2 s scan). */
    public static final long DEFAULT_FREQUENCY_FROZEN_AFTER_MS = 22_000;
    /** Fewest frequency readings in that time by default (half of a 2 s scan's). */
    public static final int DEFAULT_FREQUENCY_FROZEN_MIN_READINGS = 6;
    /** Scenario time a tie flow must stay identical to be frozen by default, ms (8 readings at a 2 s scan). */
    public static final long DEFAULT_TIE_FROZEN_AFTER_MS = 14_000;
    /** Fewest tie flow readings in that time by default (half of a 2 s scan's). */
    public static final int DEFAULT_TIE_FROZEN_MIN_READINGS = 4;

    /**
     * Frequency: 10 s age, f0 ± 5 Hz, 5 Hz/s, frozen after 22 s of scenario time with identical
     * readings (exact repeats, at least 6), hold last good 8 s. 22 s is twelve readings at a 2 s scan:
     * a live meter with 1 mHz noise at 1 mHz resolution puts a reading in its most likely bin with a
     * chance of about 0.38, so twelve equal readings in a row come about once in 10⁵ readings (two to
     * three days at a 2 s scan, and then only a short suspension). Lost scans inside the 22 s do not
     * delay the verdict; six readings at least keep two equal readings far apart from being one.
     */
    static InputRule defaultFrequencyRule(double f0Hz) {
        return new InputRule(10_000, f0Hz - 5, f0Hz + 5, 5.0, DEFAULT_FREQUENCY_FROZEN_AFTER_MS,
                DEFAULT_FREQUENCY_FROZEN_MIN_READINGS, 0.0, FallbackPolicy.HOLD_LAST_GOOD, 8_000);
    }

    /**
     * Tie flow: 10 s age, ±20000 MW, rate off, frozen after 14 s of scenario time with identical
     * readings (at least 4), hold last good 8 s.
     */
    static InputRule defaultTieRule() {
        return new InputRule(10_000, -20_000, 20_000, Double.POSITIVE_INFINITY, DEFAULT_TIE_FROZEN_AFTER_MS,
                DEFAULT_TIE_FROZEN_MIN_READINGS, 0.0, FallbackPolicy.HOLD_LAST_GOOD, 8_000);
    }
}
