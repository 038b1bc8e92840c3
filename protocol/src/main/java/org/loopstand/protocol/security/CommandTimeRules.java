package org.loopstand.protocol.security;

import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

/**
 * The time rules every receiver applies to a command or a controller status, stated once for the
 * controller, the unit response test and the unit. A message that breaks one of them never moves a
 * unit's epoch, seq history or load reference.
 *
 * <ul>
 * <li><b>Epoch unit</b>: epoch milliseconds (the controller's start or takeover on its own clock),
 * ≥ 0. A restart or takeover of the same controller id raises it.</li>
 * <li><b>Epoch bound</b>: epoch ≤ receiver's now + {@value #MAX_EPOCH_AHEAD_MS} ms. The allowance is
 * wide because a controller takes its epoch from the wall clock while a held or slowed scenario
 * clock may lag it; it only stops an absurd epoch (10^15, Long.MAX_VALUE) from fencing forever.</li>
 * <li><b>Lifetime bound</b>: 0 &lt; validUntil − issuedAt ≤ {@value #MAX_LIFETIME_MS} ms (the
 * longest command validity the rig sends: a pulse-test plan allows at most 60 s, the controller
 * one cycle of at most 10 s), else {@link RefusalReason#BAD_LIFETIME}.</li>
 * <li><b>Issue time</b>: issuedAt ≤ receiver's now + {@value #MAX_ISSUED_AHEAD_MS} ms (clock skew
 * allowance), else {@link RefusalReason#NOT_YET_VALID}.</li>
 * </ul>
 */
public final class CommandTimeRules {
    /** Longest validUntil − issuedAt accepted, ms. */
    public static final long MAX_LIFETIME_MS = 60_000;
    /** Furthest issuedAt may be ahead of the receiver's clock, ms. */
    public static final long MAX_ISSUED_AHEAD_MS = 30_000;
    /** Furthest an epoch may be ahead of the receiver's clock, ms (one day). */
    public static final long MAX_EPOCH_AHEAD_MS = 86_400_000L;

    private CommandTimeRules() {
    }

    /**
     * @param nowMs receiver's clock, epoch ms
     * @return null when the command's times are within the rules, else the refusal
     */
    public static VerificationResult check(UnitCommand c, long nowMs) {
        long lifetimeMs = c.validUntil() - c.issuedAt();
        if (lifetimeMs <= 0 || lifetimeMs > MAX_LIFETIME_MS) {
            return VerificationResult.refused(RefusalReason.BAD_LIFETIME, "validUntil − issuedAt is " + lifetimeMs
                    + " ms, must be in (0, " + MAX_LIFETIME_MS + "] ms");
        }
        if (c.issuedAt() > nowMs + MAX_ISSUED_AHEAD_MS) {
            return VerificationResult.refused(RefusalReason.NOT_YET_VALID, "issuedAt " + c.issuedAt() + " is "
                    + (c.issuedAt() - nowMs) + " ms ahead of this unit's clock (allowance " + MAX_ISSUED_AHEAD_MS + " ms)");
        }
        if (!epochWithinBound(c.epoch(), nowMs)) {
            return VerificationResult.refused(RefusalReason.NOT_YET_VALID, epochDetail(c.epoch(), nowMs));
        }
        return null;
    }

    /** @return whether {@code epoch} is within [0, now + {@value #MAX_EPOCH_AHEAD_MS}] */
    public static boolean epochWithinBound(long epoch, long nowMs) {
        return epoch >= 0 && epoch - nowMs <= MAX_EPOCH_AHEAD_MS;
    }

    /** @return the sentence naming an epoch beyond the bound */
    public static String epochDetail(long epoch, long nowMs) {
        return "epoch " + epoch + " ms is " + (epoch - nowMs) + " ms ahead of this unit's clock (allowance "
                + MAX_EPOCH_AHEAD_MS + " ms)";
    }
}
