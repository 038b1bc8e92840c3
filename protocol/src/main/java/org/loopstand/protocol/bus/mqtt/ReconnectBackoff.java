package org.loopstand.protocol.bus.mqtt;

import java.util.Objects;
import java.util.Random;

/**
 * Capped exponential backoff with jitter for reconnect attempts:
 * {@code delay_n = min(maxMs, initialMs · 2^n) · (1 ± jitter)}, n = 0 for the first retry.
 * Jitter spreads the reconnects of many clients after a broker restart so they do not arrive at once.
 * Pure apart from the injected {@link Random}; not thread-safe (one reconnect thread uses it).
 */
public final class ReconnectBackoff {
    private final long initialMs;
    private final long maxMs;
    private final double jitterFraction;
    private final Random random;

    /**
     * @param initialMs      first delay, ms, &gt; 0
     * @param maxMs          cap before jitter, ms, ≥ initialMs
     * @param jitterFraction relative spread in [0, 1): 0.2 gives delays within ±20 % of the base
     * @param random         source of the jitter (seeded in tests)
     */
    public ReconnectBackoff(long initialMs, long maxMs, double jitterFraction, Random random) {
        if (initialMs <= 0) {
            throw new IllegalArgumentException("initialMs must be > 0, got " + initialMs);
        }
        if (maxMs < initialMs) {
            throw new IllegalArgumentException("maxMs must be ≥ initialMs (" + initialMs + "), got " + maxMs);
        }
        if (!(jitterFraction >= 0 && jitterFraction < 1)) {
            throw new IllegalArgumentException("jitterFraction must be in [0, 1), got " + jitterFraction);
        }
        this.initialMs = initialMs;
        this.maxMs = maxMs;
        this.jitterFraction = jitterFraction;
        this.random = Objects.requireNonNull(random, "random");
    }

    /** @return {@code min(maxMs, initialMs · 2^attempt)} in ms, without jitter; attempt ≥ 0 */
    public long baseDelayMs(int attempt) {
        if (attempt < 0) {
            throw new IllegalArgumentException("attempt must be ≥ 0, got " + attempt);
        }
        // Shifting past the cap (or past 62 bits) would overflow: the cap is reached long before.
        if (attempt >= 62 || initialMs > (maxMs >> attempt)) {
            return maxMs;
        }
        return Math.min(maxMs, initialMs << attempt);
    }

    /** @return the base delay of this attempt with a uniform jitter of ±jitterFraction applied, ms, ≥ 0 */
    public long delayMs(int attempt) {
        long base = baseDelayMs(attempt);
        double factor = 1 + jitterFraction * (2 * random.nextDouble() - 1);
        return Math.max(0, Math.round(base * factor));
    }

    public long initialMs() {
        return initialMs;
    }

    public long maxMs() {
        return maxMs;
    }

    public double jitterFraction() {
        return jitterFraction;
    }
}
