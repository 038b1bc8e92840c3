package org.loopstand.plant.cli;

import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.runtime.UnitProcess;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.PlantClockFollower;
import org.loopstand.protocol.time.SystemTime;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code loopstand unit}: one unit's plant interface as its own process, until killed. */
@Command(name = "unit", mixinStandardHelpOptions = true,
        description = "Run one unit's plant interface on its own connection; the plant process runs its turbine (start it with --units/--no-units).")
public final class UnitCommand implements Callable<Integer> {
    @Option(names = "--site", required = true, description = "site file (YAML)")
    Path site;

    @Option(names = "--unit", required = true, description = "unit id")
    String unit;

    @Option(names = "--broker", required = true, description = "broker URL, e.g. tcp://127.0.0.1:1884")
    String broker;

    @Option(names = "--rate", defaultValue = "1", description = "scenario seconds per wall second, as the plant's (default ${DEFAULT-VALUE});"
            + " with --clock own only")
    double rate;

    @Option(names = "--clock", defaultValue = "own", paramLabel = "own|bus", description = "own: scenario time runs at --rate"
            + " from this process's start; bus: scenario time follows the plant's clock ticks (from the first fresh"
            + " tick on, holds and slow-downs included), so the unit's times agree with the plant's (default ${DEFAULT-VALUE})")
    String clockMode;

    @Option(names = "--journal", paramLabel = "DIR", description = "run folder for unit-UNIT.jsonl and unit-UNIT.hlog: the"
            + " unit's command fates, decisions with their reason codes, telemetry and acks (none if absent)")
    Path journalDir;

    /** How long --clock bus waits for the plant's first fresh tick, wall ms (tests shorten it). */
    long plantTickTimeoutMs = 10_000;

    @Mixin
    InterfaceMixin iface;

    @Mixin
    AuthOptions auth;

    @Override
    public Integer call() throws Exception {
        if (!"own".equals(clockMode) && !"bus".equals(clockMode)) {
            System.err.println("unit: --clock must be own or bus, got '" + clockMode + "'");
            return 2;
        }
        Grid grid;
        try {
            grid = SiteLoader.load(site);
        } catch (ConfigFileException e) {
            System.err.println("unit: refused:");
            System.err.println(e.getMessage());
            return 2;
        }
        if (!grid.hasUnit(unit)) {
            System.err.println("unit: refused: unit '" + unit + "' is not in site " + grid.siteId());
            return 2;
        }
        LinkSecurity security;
        try {
            security = auth.resolve(broker, System.getenv());
        } catch (SecuritySetupException e) {
            System.err.println("unit: " + e.getMessage());
            return 2;
        }
        System.err.println(security.startMessage());
        LinkFactory links;
        Clock clock;
        BusClock plantClock = null;
        try {
            links = MqttLinks.to(broker, WallClock.INSTANCE, security, grid.siteId());
            if ("bus".equals(clockMode)) {
                plantClock = plantClock(links, grid.siteId());
            }
            clock = "bus".equals(clockMode) ? plantClock : rate == 1.0 ? WallClock.INSTANCE
                    : new AcceleratedClock(WallClock.INSTANCE, rate, SystemTime.wallEpochMillis());
        } catch (IllegalArgumentException e) {
            System.err.println("unit: refused: " + e.getMessage());
            return 2;
        }
        if (clock == null) {
            System.err.println("unit: no fresh tick on " + TopicTree.forSite(grid.siteId()).clock() + " within "
                    + plantTickTimeoutMs / 1000.0 + " s (is the plant running?)");
            return 4;
        }
        UnitProcess process;
        try {
            process = new UnitProcess(grid.siteId(), grid.units().get(grid.unitIndex(unit)), iface.options(), iface.qos(),
                    links, clock);
            PlantSecurity.requireSignedCommands(security, java.util.List.of(process.unitInterface()), clock);
            if (plantClock != null) {
                // from here on every tick on the unit's own connection moves its clock (the pace keeper's holds too)
                PlantClockFollower.feed(process.bus(), TopicTree.forSite(grid.siteId()), plantClock);
                process.followPlantClock(plantClock);
            }
        } catch (IllegalArgumentException e) {
            System.err.println("unit: refused: " + e.getMessage());
            return 2;
        }
        PlantRunJournal journal;
        try {
            journal = journalDir == null ? null : PlantRunJournal.create(journalDir, "unit-" + unit, clock.epochMillis(),
                    Map.of("site", grid.siteId(), "unit", unit, "broker", broker, "clock", clockMode), clock,
                    WallClock.INSTANCE, 0);
        } catch (RuntimeException e) {
            System.err.println("unit: refused: journal in " + journalDir + ": " + e.getMessage());
            process.close();
            return 2;
        }
        if (journal != null) {
            process.journalTo(journal);
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Clock journalClock = clock;
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            process.close();
            if (journal != null) {
                journal.close(journalClock.epochMillis(), EndReason.STOPPED);
            }
            stopped.countDown();
        }, "unit-shutdown"));
        process.start();
        PlantCommand.say(String.format(Locale.ROOT, "unit: %s of site %s, broker %s, client id %s", unit, grid.siteId(),
                broker, process.bus().clientId()));
        stopped.await();
        return 0;
    }

    /**
     * Takes the plant's clock: connects as the unit (same client id and identity, no last will), waits
     * for a fresh running tick and disconnects before the unit's own connection opens (which then feeds
     * the clock every later tick).
     *
     * @return the plant's scenario time, or null when no fresh tick came in time
     */
    private BusClock plantClock(LinkFactory links, String siteId) throws InterruptedException {
        MessageBus bus = links.connect(UnitProcess.clientId(siteId, unit), null);
        try {
            // a unit's time stands while the ticks are silent: its watchdog counts the plant's time, never a guess
            return PlantClockFollower.await(bus, TopicTree.forSite(siteId), WallClock.INSTANCE, plantTickTimeoutMs,
                    BusClock.WhenSilent.STAND_STILL).orElse(null);
        } finally {
            bus.close();
        }
    }
}
