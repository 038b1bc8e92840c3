package org.loopstand.controller.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.config.SiteUnit;
import org.loopstand.controller.dispatch.DispatchResult;
import org.loopstand.controller.dispatch.EconomicDispatch;
import org.loopstand.controller.dispatch.InfeasibleDispatchException;
import org.loopstand.controller.dispatch.ParticipationFactors;
import org.loopstand.controller.dispatch.QuadraticCostUnit;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * Prints the economic dispatch (equal incremental cost, losses neglected) of a site's units with
 * a cost curve for a given demand, and their participation factors at that dispatch. Sends nothing.
 */
@Command(name = "dispatch", mixinStandardHelpOptions = true,
        description = "Economic dispatch and participation factors of a site's units for a demand (sends nothing).")
public final class DispatchCommand implements Callable<Integer> {
    @Parameters(index = "0", description = "site file (YAML), e.g. config/sites/demo-site.yaml")
    Path site;

    @Option(names = "--demand-mw", required = true, description = "demand to dispatch, MW")
    double demandMw;

    @Option(names = "--area", description = "dispatch only this area's units (default: every unit with a cost curve)")
    String area;

    @Override
    public Integer call() {
        try {
            System.out.print(render(ControllerSiteReader.read(site), demandMw, area));
            return 0;
        } catch (ConfigFileException | IllegalArgumentException e) {
            System.err.println("dispatch: " + e.getMessage());
            return 2;
        } catch (InfeasibleDispatchException e) {
            System.err.println("dispatch: infeasible: " + e.getMessage());
            return 1;
        }
    }

    /**
     * @param areaId only this area's units, or null for all
     * @return the dispatch as text: λ, each unit's output, limit and participation factor, total cost
     * @throws IllegalArgumentException when no unit has a cost curve (or the area has none)
     * @throws InfeasibleDispatchException when the demand is outside [Σ min, Σ max]
     */
    static String render(ControllerSiteConfig config, double demandMw, String areaId) {
        List<QuadraticCostUnit> units = new ArrayList<>();
        for (SiteUnit u : config.units()) {
            if (u.costC() > 0 && (areaId == null || u.area().equals(areaId))) {
                units.add(new QuadraticCostUnit(u.id(), u.costA(), u.costB(), u.costC(), u.minMw(), u.maxMw()));
            }
        }
        if (units.isEmpty()) {
            throw new IllegalArgumentException("no unit with a cost curve (costC > 0)"
                    + (areaId == null ? "" : " in area " + areaId) + " in site " + config.siteId());
        }
        DispatchResult d = EconomicDispatch.solve(units, demandMw);
        ParticipationFactors pf = ParticipationFactors.of(units, d);
        StringBuilder out = new StringBuilder();
        out.append(String.format(Locale.ROOT, "site %s%s, demand %.1f MW: lambda %.4f $/MWh, total cost %.1f $/h%n",
                config.siteId(), areaId == null ? "" : " area " + areaId, demandMw, d.lambdaDollarPerMwh(),
                d.totalCostDollarPerH()));
        out.append(String.format(Locale.ROOT, "%-24s %10s %10s %10s %-8s %8s%n", "unit", "output MW", "min MW",
                "max MW", "limit", "pf"));
        for (QuadraticCostUnit u : units) {
            String limit = d.atLimit().contains(u.unitId()) ? "at limit" : "";
            out.append(String.format(Locale.ROOT, "%-24s %10.1f %10.1f %10.1f %-8s %8.4f%n", u.unitId(),
                    d.outputMw(u.unitId()), u.minMw(), u.maxMw(), limit, pf.of(u.unitId())));
        }
        return out.toString();
    }
}
