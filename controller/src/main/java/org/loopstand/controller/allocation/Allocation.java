package org.loopstand.controller.allocation;

import java.util.List;

/**
 * @param units           per eligible unit, in input order
 * @param unallocatedMw   regulation that no unit could take (all at limits), MW
 * @param lowMw           lowest regulation level the eligible units can reach, MW
 * @param highMw          highest regulation level the eligible units can reach, MW
 * @param excluded        units left out, with the reason, e.g. {@code U7:notInRemote}
 */
public record Allocation(List<UnitAllocation> units, double unallocatedMw, double lowMw, double highMw,
                         List<String> excluded) {
    public Allocation {
        units = List.copyOf(units);
        excluded = List.copyOf(excluded);
    }
}
