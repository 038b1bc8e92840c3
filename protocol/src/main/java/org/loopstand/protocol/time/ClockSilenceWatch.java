package org.loopstand.protocol.time;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;


/**
 * Names a silent time source ({@code --clock bus}): when no clock tick came for the {@link BusClock}'s
 * silence limit while the last one said running, journals {@code clockSilent} (wall ms silent, the
 * last tick's scenario time and rate); a controller adds the reason {@code clockSilent} to every status
 * while it lasts ({@link #withSilence}); when a tick comes again, journals {@code clockHeard} with how long
 * the silence lasted. A stall of the plant shorter than the limit only stops the follower's time (no
 * cycle runs), and is not a silence. Used by the controller and by a unit process ({@code --clock bus}).
 * Agent thread only.
 */
public final class ClockSilenceWatch {
    /** Status reason while the time source is silent. */
    public static final String REASON = "clockSilent";

    private final BusClock clock;
    private final Consumer<Map<String, Object>> events;
    private boolean silent;
    private long silencesSeen;

    /**
     * @param clock  the clock followed from the ticks
     * @param events takes each journal event
     */
    public ClockSilenceWatch(BusClock clock, Consumer<Map<String, Object>> events) {
        this.clock = clock;
        this.events = events;
    }

    /** Looks at the clock once (each agent pass). @return 1 when an event was journaled, else 0 */
    public int poll() {
        long silentNanos = clock.silentWallNanos();
        if (silentNanos > 0 && !silent) {
            silent = true;
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("event", "clockSilent");
            e.put("silentWallMs", silentNanos / 1_000_000L);
            e.put("limitWallMs", BusClock.silentAfterWallNanos(clock.rate()) / 1_000_000L);
            e.put("lastTickAtMs", clock.lastTickEpochMs());
            e.put("lastTickRate", clock.rate());
            events.accept(e);
            return 1;
        }
        long ended = clock.silencesEnded();
        if (ended != silencesSeen) {
            silencesSeen = ended;
            boolean wasNamed = silent;
            silent = false;
            events.accept(Map.of("event", "clockHeard", "silentWallMs", clock.lastSilenceWallNanos() / 1_000_000L,
                    "silenceJournaled", wasNamed));
            return 1;
        }
        return 0;
    }

    /** @return true while the time source is silent (the last {@link #poll} said so) */
    public boolean silent() {
        return silent;
    }

    /** @return {@code reasons} with {@value #REASON} added while silent */
    public List<String> withSilence(List<String> reasons) {
        if (!silent) {
            return reasons;
        }
        List<String> r = new java.util.ArrayList<>(reasons);
        r.add(REASON);
        return r;
    }
}
