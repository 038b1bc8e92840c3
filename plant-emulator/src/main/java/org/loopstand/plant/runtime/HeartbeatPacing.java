package org.loopstand.plant.runtime;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.Consumer;
import java.util.function.LongUnaryOperator;

import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.time.Clock;

/**
 * Holds the scenario clock while the controller's status is late, for a bounded wall time. At a high
 * rate the units' watchdog is short in wall time (30 s of scenario time is 0.75 s at rate 40), so a
 * controller process that is not scheduled for a second (a loaded machine) would make every unit leave
 * remote: a verdict the rate made, not the controller. When the freshest status any armed unit in remote
 * has seen is older than {@code share} × the watchdog, the clock is held (physics, watchdog and all) until
 * a status arrives or {@code maxHoldWallNanos} of wall time passed; then it runs on, and a controller that
 * is really gone still meets the watchdog (a second hold waits for a fresh status first). Journaled as
 * {@code paceHeld} with {@code reason: controllerLate}, {@code statusAgeS}, {@code limitS},
 * {@code heldWallMs}, {@code statusCame}. Loop thread only ({@link #onCycle()} once per loop cycle).
 */
public final class HeartbeatPacing {
    /** Name of its hold on the scenario clock ({@link HeldStartClock#hold(String)}). */
    public static final String HOLD = "controllerLate";
    private final HeldStartClock clock;
    private final Clock wall;
    private final LongUnaryOperator statusAgeNanos;
    private final long limitNanos;
    private final long maxHoldWallNanos;
    private final Consumer<Map<String, Object>> journal;
    private boolean holding;
    private boolean waitForFreshStatus;
    private long holdStartWallNanos;
    private long holdAgeNanos;
    private long holds;
    private long heldWallNanos;

    /**
     * @param clock            the scenario clock it holds
     * @param wall             wall clock for the bound
     * @param statusAgeNanos   scenario ns since the freshest controller status at the given clock reading, -1 when
     *                         no unit watches one
     * @param limitNanos       status age beyond which the clock is held, scenario ns, &gt; 0
     * @param maxHoldWallNanos longest hold, wall ns, &gt; 0
     * @param journal          takes each {@code paceHeld} entry
     */
    public HeartbeatPacing(HeldStartClock clock, Clock wall, LongUnaryOperator statusAgeNanos, long limitNanos,
                           long maxHoldWallNanos, Consumer<Map<String, Object>> journal) {
        if (limitNanos <= 0 || maxHoldWallNanos <= 0) {
            throw new IllegalArgumentException("status age limit and hold bound must be positive, got " + limitNanos
                    + " ns and " + maxHoldWallNanos + " ns");
        }
        this.clock = clock;
        this.wall = wall;
        this.statusAgeNanos = statusAgeNanos;
        this.limitNanos = limitNanos;
        this.maxHoldWallNanos = maxHoldWallNanos;
        this.journal = journal;
    }

    /** @return the freshest status age over the in-process units' interfaces (ns), -1 when none is armed in remote */
    public static LongUnaryOperator freshestStatusAge(List<UnitDutyCycle> units) {
        return now -> {
            long age = -1;
            for (UnitDutyCycle u : units) {
                long a = u.unit().heartbeatAgeNanos(now);
                if (a >= 0 && (age < 0 || a < age)) {
                    age = a;
                }
            }
            return age;
        };
    }

    /** Loop thread, once per loop cycle. */
    public void onCycle() {
        long age = statusAgeNanos.applyAsLong(clock.monotonicNanos());
        boolean late = age > limitNanos;
        if (holding) {
            long w = wall.monotonicNanos();
            if (!late || w - holdStartWallNanos >= maxHoldWallNanos) {
                clock.letGo(HOLD);
                holding = false;
                waitForFreshStatus = late;
                holds++;
                heldWallNanos += w - holdStartWallNanos;
                Map<String, Object> e = new LinkedHashMap<>();
                e.put("event", "paceHeld");
                e.put("reason", "controllerLate");
                e.put("atS", clock.monotonicNanos() / 1e9);
                e.put("statusAgeS", holdAgeNanos / 1e9);
                e.put("limitS", limitNanos / 1e9);
                e.put("heldWallMs", (w - holdStartWallNanos) / 1e6);
                e.put("statusCame", !late);
                journal.accept(e);
            }
            return;
        }
        if (!late) {
            waitForFreshStatus = false;
        } else if (!waitForFreshStatus && clock.running()) {
            clock.hold(HOLD);
            holding = true;
            holdStartWallNanos = wall.monotonicNanos();
            holdAgeNanos = age;
        }
    }

    /** @return true while it holds the clock */
    public boolean holding() {
        return holding;
    }

    /** @return the plant's end line on these holds */
    public String describe() {
        return String.format(Locale.ROOT, "clock held %d times for a late controller status (%.0f ms in all, limit %.1f s"
                + " of scenario time, at most %.0f ms each)", holds, heldWallNanos / 1e6, limitNanos / 1e9,
                maxHoldWallNanos / 1e6);
    }
}
