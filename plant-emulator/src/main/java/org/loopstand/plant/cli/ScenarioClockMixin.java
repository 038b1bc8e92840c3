package org.loopstand.plant.cli;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.Locale;
import java.util.function.Consumer;
import java.util.function.Supplier;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.HeartbeatPacing;
import org.loopstand.plant.runtime.HeldStartClock;
import org.loopstand.plant.runtime.PhysicsWarmUp;
import org.loopstand.plant.runtime.PlantPacing;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Option;

/**
 * The {@code plant} options of the scenario clock: holding it until go, warming the physics up
 * before go, and the pace keeper ({@link PlantPacing}, docs/plant.md "Pacing"). Used by one command
 * run at a time (it keeps that run's pace keeper).
 */
public final class ScenarioClockMixin {
    /** Physics steps of the warm-up before go, at most. */
    static final long WARM_UP_STEPS = 100_000;
    /** Wall time of the warm-up before go, ns, at most. */
    static final long WARM_UP_WALL_NANOS = 2_000_000_000L;

    @Option(names = "--wait-go", description = "connect, print the ready line, then hold scenario time at 0 until a line 'go' arrives on stdin (the rehearsal starts the controller in between)")
    boolean waitGo;

    @Option(names = "--pace-lag-s", defaultValue = "1", description = "when the physics falls more than this many scenario"
            + " seconds behind an accelerated clock, hold the clock until it caught up and go on at a lower rate (journaled"
            + " paceSlowed); 0 = never slow the clock (default ${DEFAULT-VALUE})")
    double paceLagS;

    @Option(names = "--pace-command-share", defaultValue = "" + PlantPacing.COMMAND_AGE_SHARE, description = "with the"
            + " pace keeper on: a command that arrives with more than this share of its validity gone slows the clock in"
            + " proportion, never below real time (paceSlowed, reason commandPath), and stops watching when the age does"
            + " not follow the rate (paceWatchStopped, reason ageNotFromPath); 0 = never, 0 – 1 (default ${DEFAULT-VALUE})")
    double paceCommandShare;

    @Option(names = "--pace-factor", defaultValue = "1.1", description = "say RATE NOT KEPT at the end when the asked rate"
            + " over the rate kept exceeds this factor (default ${DEFAULT-VALUE})")
    double paceFactor;

    private PlantPacing pacing;
    private HeartbeatPacing heartbeats;

    /** Share of the units' watchdog a controller status may be late before the clock is held for it. */
    static final double STATUS_LATE_SHARE = 0.5;
    /** Longest hold for a late controller status, wall ns (as the controller's own silence limit). */
    static final long STATUS_HOLD_WALL_NANOS = 2_000_000_000L;

    /** @throws IllegalArgumentException naming a wrong pace option */
    void check() {
        if (!(paceLagS >= 0) || Double.isInfinite(paceLagS)) {
            throw new IllegalArgumentException("--pace-lag-s must be 0 (off) or a positive number of scenario seconds, got " + paceLagS);
        }
        if (!(paceCommandShare >= 0 && paceCommandShare <= 1)) {
            throw new IllegalArgumentException("--pace-command-share must be 0 (off) or a share of a command's validity in (0, 1], got "
                    + paceCommandShare);
        }
        if (!(paceFactor >= 1) || Double.isInfinite(paceFactor)) {
            throw new IllegalArgumentException("--pace-factor must be at least 1, got " + paceFactor);
        }
    }

    /**
     * @return the run's scenario clock: a {@link HeldStartClock} when time is held until go or
     *         accelerated (released at once without {@code --wait-go}), the wall clock at rate 1
     */
    Clock clock(double rate) {
        if (!waitGo && rate == 1.0) {
            return WallClock.INSTANCE; // real time is never paced: a live plant keeps the wall clock
        }
        HeldStartClock held = new HeldStartClock(WallClock.INSTANCE, rate);
        if (!waitGo) {
            held.release();
        }
        return held;
    }

    /** Before {@code runner.start()}: the pace keeper watches the loop's steps (when the clock can be slowed). */
    void pace(Clock clock, PlantRunner runner, double watchdogS) {
        if (clock instanceof HeldStartClock held && paceLagS > 0) {
            pacing = new PlantPacing(held, WallClock.INSTANCE, Math.round(runner.sim().stepS() * 1e9),
                    new org.loopstand.plant.runtime.PacingSettings(paceLagS, paceFactor, 0.8, 5.0), runner.agent()::noteEvent)
                    .watch(runner.lateness());
            if (paceCommandShare != 0) {
                pacing.watchCommandsBeyond(paceCommandShare);
                runner.watchCommandArrivals(pacing::onCommandArrived);
            }
            if (!waitGo) {
                pacing.started();
            }
            heartbeats = new HeartbeatPacing(held, WallClock.INSTANCE,
                    HeartbeatPacing.freshestStatusAge(runner.unitCycles()),
                    Math.round(STATUS_LATE_SHARE * watchdogS * 1e9), STATUS_HOLD_WALL_NANOS, runner.agent()::noteEvent);
            runner.agent().watchCycles(heartbeats::onCycle);
        }
    }

    /**
     * With {@code --wait-go}: warms the physics up, waits for the line "go" on stdin and starts scenario time.
     *
     * @return false when stdin ended before "go"
     */
    boolean awaitGo(Clock clock, Supplier<GridSimulator> warmUpSims, Consumer<String> say) throws IOException {
        if (!waitGo) {
            return true;
        }
        long t0 = WallClock.INSTANCE.monotonicNanos();
        long steps = PhysicsWarmUp.run(warmUpSims, WallClock.INSTANCE, WARM_UP_STEPS, WARM_UP_WALL_NANOS);
        say.accept(String.format(Locale.ROOT, "plant: physics warmed up (%d steps in %.0f ms)", steps,
                (WallClock.INSTANCE.monotonicNanos() - t0) / 1e6));
        BufferedReader in = new BufferedReader(new InputStreamReader(System.in, StandardCharsets.UTF_8));
        for (String line; (line = in.readLine()) != null; ) {
            if ("go".equals(line.trim())) {
                ((HeldStartClock) clock).release();
                if (pacing != null) {
                    pacing.started();
                }
                return true;
            }
        }
        return false;
    }

    /** At the scenario's end, before the loop closes: journals the pace summary and prints the pace figures. */
    void end(double simulatedS, Consumer<String> say) {
        if (pacing != null) {
            say.accept("plant: " + pacing.describe(simulatedS));
            say.accept("plant: " + heartbeats.describe());
            pacing.finish(simulatedS).ifPresent(line -> say.accept("plant: " + line));
        }
    }
}
