package org.loopstand.plant.cli;

import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.UnitProcess;
import org.loopstand.plant.site.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.SystemTime;
import org.loopstand.protocol.time.WallClock;
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

    @Option(names = "--rate", defaultValue = "1", description = "scenario seconds per wall second, as the plant's (default ${DEFAULT-VALUE})")
    double rate;

    @Mixin
    InterfaceMixin iface;

    @Mixin
    AuthOptions auth;

    @Override
    public Integer call() throws Exception {
        Grid grid;
        try {
            grid = SiteLoader.load(site);
        } catch (ConfigFileException e) {
            System.err.println("refused:");
            System.err.println(e.getMessage());
            return 2;
        }
        if (!grid.hasUnit(unit)) {
            System.err.println("refused: unit '" + unit + "' is not in site " + grid.siteId());
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
        Clock clock = rate == 1.0 ? WallClock.INSTANCE : new AcceleratedClock(WallClock.INSTANCE, rate, SystemTime.wallEpochMillis());
        UnitProcess process;
        try {
            process = new UnitProcess(grid.siteId(), grid.units().get(grid.unitIndex(unit)), iface.options(), iface.qos(),
                    MqttLinks.to(broker, WallClock.INSTANCE, security, grid.siteId()), clock);
            PlantSecurity.requireSignedCommands(security, java.util.List.of(process.unitInterface()), clock);
        } catch (IllegalArgumentException e) {
            System.err.println("refused: " + e.getMessage());
            return 2;
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            process.close();
            stopped.countDown();
        }, "unit-shutdown"));
        process.start();
        PlantCommand.say(String.format(Locale.ROOT, "unit: %s of site %s, broker %s, client id %s", unit, grid.siteId(),
                broker, process.bus().clientId()));
        stopped.await();
        return 0;
    }
}
