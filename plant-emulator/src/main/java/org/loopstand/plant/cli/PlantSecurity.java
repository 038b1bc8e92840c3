package org.loopstand.plant.cli;

import java.io.IOException;
import java.util.Collection;
import java.util.Map;
import java.util.TreeSet;
import org.loopstand.plant.broker.BrokerAuthExtension;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.security.CommandVerifier;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.ReplayGuard;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.security.SecurityEventSink;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.time.Clock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The plant side's security wiring: one {@link CommandVerifier} (one replay memory) per process for
 * every unit interface in it, the broker access model of the site, and the embedded broker's auth.
 */
public final class PlantSecurity {
    private static final Logger LOG = LoggerFactory.getLogger("org.loopstand.plant.security");

    /** Security events go to the log; the refusal itself is journaled by the unit interface. */
    static final SecurityEventSink LOG_SINK = (tMs, kind, fields) -> LOG.warn("{} {} {}", tMs, kind, fields);

    private PlantSecurity() {
    }

    /**
     * Makes every interface require signed commands, when the security in force signs commands, and
     * signed statuses from every controller the keys file holds a status key for.
     *
     * @param clock the interfaces' clock (expiry and key validity are judged on it)
     * @return the verifier set, or null in insecure mode (nothing set)
     */
    public static CommandVerifier requireSignedCommands(LinkSecurity security, Collection<UnitPlantInterface> units,
            Clock clock) {
        if (!security.signsCommands()) {
            return null;
        }
        CommandVerifier v = new CommandVerifier(security.keys().orElseThrow(), new ReplayGuard(), clock,
                new MessageCodec(), LOG_SINK);
        units.forEach(u -> u.verifyCommandsWith(v));
        StatusSeal seal = new StatusSeal(security.keys().orElseThrow(), new MessageCodec());
        units.forEach(u -> u.verifyStatusWith(seal));
        return v;
    }

    /** @return the site's broker identities: the given controllers, every unit and area */
    public static BrokerAccessModel accessModel(Grid grid, Collection<String> controllerIds) {
        BrokerAccessModel.Builder b = BrokerAccessModel.forSite(grid.siteId());
        new TreeSet<>(controllerIds).forEach(b::controller);
        return b.units(grid.units().stream().map(GeneratingUnit::id).toList())
                .areas(grid.areas().stream().map(Area::id).toList()).build();
    }

    /**
     * @return the embedded broker's auth for that security, or null in insecure mode
     * @throws SecuritySetupException when no users file was given for a secured embedded broker
     */
    static BrokerAuthExtension embeddedAuth(LinkSecurity security, Grid grid, Collection<String> controllerIds)
            throws SecuritySetupException {
        if (security.insecure()) {
            return null;
        }
        if (security.credentialsFile().isEmpty()) {
            throw new SecuritySetupException("a secured embedded broker needs the site's users file: --credentials-file FILE");
        }
        try {
            Map<String, char[]> users = LinkSecurity.readUsersFile(security.credentialsFile().get());
            return new BrokerAuthExtension(accessModel(grid, controllerIds), users);
        } catch (IOException | IllegalArgumentException e) {
            throw new SecuritySetupException("users file: " + e.getMessage());
        }
    }

    /** @throws SecuritySetupException when the grouping cannot work under the broker's per-unit rules */
    static void checkGrouping(LinkSecurity security, ConnectionGrouping grouping) throws SecuritySetupException {
        if (!security.insecure() && grouping != ConnectionGrouping.PER_UNIT) {
            throw new SecuritySetupException("--grouping " + grouping.cliName() + " shares one connection between units,"
                    + " which the broker's per-unit identities forbid: use --grouping per-unit with broker auth");
        }
    }
}
