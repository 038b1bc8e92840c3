package org.loopstand.plant.physics;

import java.util.Arrays;
import java.util.Locale;

/** How {@link GridSimulator} advances the grid by one fixed step (docs/physics.md, "Integrator and its accuracy"). */
public enum Integrator {
    /** classical fourth-order Runge–Kutta on the whole right-hand side (the default) */
    RK4,
    /**
     * each unit's governor and turbine stepped exactly by its precomputed matrix exponential, the areas' frequencies
     * taken as quintic Hermite polynomials over the step, solved together with the ties (see {@code ExactStepper} and
     * {@code AreaEquations}); sixth order, and no step limit from the units' time constants
     */
    EXACT;

    /** @return the integrator named {@code text} ({@code rk4} or {@code exact}, any case) */
    public static Integrator parse(String text) {
        for (Integrator i : values()) {
            if (i.name().equalsIgnoreCase(text.trim())) {
                return i;
            }
        }
        throw new IllegalArgumentException("unknown integrator '" + text + "'; known: "
                + Arrays.toString(Arrays.stream(values()).map(Integrator::label).toArray()));
    }

    /** @return the name used in files and on the command line */
    public String label() {
        return name().toLowerCase(Locale.ROOT);
    }
}
