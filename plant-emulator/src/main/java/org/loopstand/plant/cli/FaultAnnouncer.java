package org.loopstand.plant.cli;

import java.util.function.Consumer;

import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;

/**
 * Says on the plant's standard output when a fault starts and stops, in one stable line each
 * ({@value #STARTED}{@code <type>:<id>}, {@value #STOPPED}{@code <type>:<id>}), so whoever runs the plant
 * (a person, or the rehearsal's progress line) sees which faults are active.
 */
public final class FaultAnnouncer implements FaultObserver {
    /** Line prefix of a fault start. */
    public static final String STARTED = "plant: fault active ";
    /** Line prefix of a fault stop. */
    public static final String STOPPED = "plant: fault ended ";

    private final Consumer<String> out;

    public FaultAnnouncer(Consumer<String> out) {
        this.out = out;
    }

    /** @return the name a fault goes by in these lines: {@code <type>:<id>} */
    public static String label(FaultSpec spec) {
        return spec.type().name() + ":" + spec.id();
    }

    @Override
    public void faultStarted(long tMs, FaultSpec spec, String source) {
        out.accept(STARTED + label(spec) + " (" + source + ")");
    }

    @Override
    public void networkFault(long tMs, FaultSpec spec, String action, java.util.List<String> links, String detail) {
        out.accept("plant: network fault " + label(spec) + " " + action + " between " + spec.targets().stream()
                .map(t -> t.id()).toList() + (detail.isEmpty() ? " on links " + links : ": " + detail));
    }

    @Override
    public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
        out.accept(STOPPED + label(spec) + " (" + reason + ")");
    }
}
