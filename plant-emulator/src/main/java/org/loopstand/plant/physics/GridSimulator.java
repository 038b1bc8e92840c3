package org.loopstand.plant.physics;

import java.util.SplittableRandom;

import org.loopstand.plant.grid.Grid;

/**
 * Integrates a {@link Grid} at a fixed step, with the classical fourth-order Runge–Kutta method (default) or the
 * exact discretisation of the units' linear blocks ({@link Integrator#EXACT}). Time is
 * the simulator's own ({@link #timeS()} = steps × step); it never reads a clock. Not thread-safe: one
 * owner thread calls {@link #step()} and the setters.
 *
 * <p>Sign conventions: tie flow + = from the tie's {@code from} area to its {@code to} area; net
 * interchange + = export. Load noise and profile values are held or evaluated per step as described in
 * docs/physics.md.
 */
public final class GridSimulator {
    private final Grid grid;
    private final GridDynamics dynamics;
    private final double stepS;
    private final double[] x;
    private final double[] k1;
    private final double[] k2;
    private final double[] k3;
    private final double[] k4;
    private final double[] stage;
    private final OrnsteinUhlenbeckNoise[] noise;
    private final Integrator integrator;
    private final ExactStepper exact;
    private long steps;

    /** Default step for the grid, start at hour 0, seed 0. */
    public GridSimulator(Grid grid) {
        this(grid, new StepSizeRule(grid).defaultStepS(), 0L, 0.0);
    }

    /**
     * @param stepS          fixed step, s; refused with a message when too coarse for the grid
     * @param seed           seeds every load's noise (each load gets its own stream split in site order)
     * @param startHourOfDay time of day at t = 0, h, for the loads' daily shapes
     */
    public GridSimulator(Grid grid, double stepS, long seed, double startHourOfDay) {
        this(grid, stepS, seed, startHourOfDay, Integrator.RK4);
    }

    /**
     * @param stepS          fixed step, s; refused with a message when too coarse for the grid and the integrator
     * @param seed           seeds every load's noise (each load gets its own stream split in site order)
     * @param startHourOfDay time of day at t = 0, h, for the loads' daily shapes
     * @param integrator     how a step is taken ({@link Integrator#RK4} unless asked otherwise)
     */
    public GridSimulator(Grid grid, double stepS, long seed, double startHourOfDay, Integrator integrator) {
        this.integrator = java.util.Objects.requireNonNull(integrator, "integrator");
        new StepSizeRule(grid).check(stepS, integrator);
        this.grid = grid;
        this.stepS = stepS;
        this.dynamics = new GridDynamics(grid, startHourOfDay);
        this.x = dynamics.initialState();
        this.exact = integrator == Integrator.EXACT ? new ExactStepper(dynamics, stepS) : null;
        int n = x.length;
        k1 = new double[n];
        k2 = new double[n];
        k3 = new double[n];
        k4 = new double[n];
        stage = new double[n];
        SplittableRandom root = new SplittableRandom(seed);
        noise = new OrnsteinUhlenbeckNoise[grid.loads().size()];
        for (int l = 0; l < noise.length; l++) {
            var load = grid.loads().get(l);
            noise[l] = new OrnsteinUhlenbeckNoise(root.split(), load.noiseSigmaMw(), load.noiseTauS(), stepS);
        }
    }

    /** Advances the grid by one step. */
    public void step() {
        double t = timeS();
        for (int l = 0; l < noise.length; l++) {
            dynamics.loadNoiseMw[l] = noise[l].valueMw();
        }
        if (exact != null) {
            exact.step(t, x);
        } else {
            rungeKutta(t);
        }
        dynamics.clampValves(x);
        steps++;
        dynamics.schedule.settle(timeS());
        for (OrnsteinUhlenbeckNoise nz : noise) {
            nz.advance();
        }
    }

    private void rungeKutta(double t) {
        int n = x.length;
        double h = stepS;
        dynamics.derivatives(t, x, k1);
        for (int i = 0; i < n; i++) {
            stage[i] = x[i] + 0.5 * h * k1[i];
        }
        dynamics.derivatives(t + 0.5 * h, stage, k2);
        for (int i = 0; i < n; i++) {
            stage[i] = x[i] + 0.5 * h * k2[i];
        }
        dynamics.derivatives(t + 0.5 * h, stage, k3);
        for (int i = 0; i < n; i++) {
            stage[i] = x[i] + h * k3[i];
        }
        dynamics.derivatives(t + h, stage, k4);
        double h6 = h / 6.0;
        for (int i = 0; i < n; i++) {
            x[i] += h6 * (k1[i] + 2.0 * (k2[i] + k3[i]) + k4[i]);
        }
    }

    /** Steps until {@link #timeS()} reaches {@code timeS} (to within half a step). */
    public void advanceTo(double timeS) {
        long target = Math.round(timeS / stepS);
        while (steps < target) {
            step();
        }
    }

    public Grid grid() {
        return grid;
    }

    /** @return simulated time since the start, s */
    public double timeS() {
        return steps * stepS;
    }

    /** @return how each step is taken */
    public Integrator integrator() {
        return integrator;
    }

    /** @return the fixed integration step, s */
    public double stepS() {
        return stepS;
    }

    public long stepCount() {
        return steps;
    }

    // ---- areas

    public double frequencyHz(String areaId) {
        return frequencyHz(grid.areaIndex(areaId));
    }

    public double frequencyHz(int area) {
        return dynamics.nominalHz[area] + x[area];
    }

    /** @return f − f0, Hz */
    public double frequencyDeviationHz(int area) {
        return x[area];
    }

    /** @return actual consumption of the area's loads (frequency dependence included) plus event changes, MW */
    public double loadMw(String areaId) {
        return loadMw(grid.areaIndex(areaId));
    }

    public double loadMw(int area) {
        double t = timeS();
        double hour = dynamics.startHourOfDay + t / 3600.0;
        double sum = dynamics.schedule.offsetMw(area, t);
        for (int l = 0; l < dynamics.loadArea.length; l++) {
            if (dynamics.loadArea[l] == area) {
                // noise of the next step is what the next step will use; report the one just used
                sum += dynamics.loadMw(l, hour, x[area]);
            }
        }
        return sum;
    }

    /** @return the area's damping term D·Δf, MW (power the frequency-sensitive load gives back) */
    public double dampingMw(int area) {
        return dynamics.dampingMwPerHz[area] * x[area];
    }

    /** @return net interchange of the area, MW, + = export */
    public double netInterchangeMw(String areaId) {
        return netInterchangeMw(grid.areaIndex(areaId));
    }

    public double netInterchangeMw(int area) {
        double sum = 0;
        for (int t = 0; t < dynamics.tieCount; t++) {
            if (dynamics.tieFrom[t] == area) {
                sum += tieFlowMw(t);
            } else if (dynamics.tieTo[t] == area) {
                sum -= tieFlowMw(t);
            }
        }
        return sum;
    }

    /** @return total mechanical power of the area's units, MW */
    public double generationMw(int area) {
        double sum = 0;
        for (int u = 0; u < dynamics.unitCount; u++) {
            if (dynamics.unitArea[u] == area) {
                sum += outputMw(u);
            }
        }
        return sum;
    }

    /** Steps the area's load by {@code deltaMw} from now on (frequency independent). */
    public void stepLoadMw(String areaId, double deltaMw) {
        requireFinite(deltaMw, "deltaMw");
        dynamics.schedule.step(grid.areaIndex(areaId), deltaMw);
    }

    /** Ramps the area's load by {@code deltaMw} linearly over {@code durationS}, starting now. */
    public void rampLoadMw(String areaId, double deltaMw, double durationS) {
        requireFinite(deltaMw, "deltaMw");
        if (!(durationS >= 0)) {
            throw new IllegalArgumentException("durationS must be 0 or more, got " + durationS);
        }
        dynamics.schedule.ramp(grid.areaIndex(areaId), timeS(), durationS, deltaMw);
    }

    // ---- ties

    /** @return flow, MW, + = from the tie's {@code from} area to its {@code to} area */
    public double tieFlowMw(String tieId) {
        return tieFlowMw(grid.tieIndex(tieId));
    }

    public double tieFlowMw(int tie) {
        return dynamics.tieScheduledMw[tie] + x[dynamics.areaCount + tie];
    }

    // ---- units

    /** @return mechanical power, MW */
    public double outputMw(String unitId) {
        return outputMw(grid.unitIndex(unitId));
    }

    public double outputMw(int unit) {
        return dynamics.online[unit] ? dynamics.mechanicalPowerMw(unit, x) : 0.0;
    }

    /** @return valve (steam) or gate (hydro) position in MW of output */
    public double valvePositionMw(int unit) {
        return x[dynamics.unitOffset + GridDynamics.SLOTS_PER_UNIT * unit];
    }

    public double loadReferenceMw(String unitId) {
        return loadReferenceMw(grid.unitIndex(unitId));
    }

    public double loadReferenceMw(int unit) {
        return dynamics.loadReferenceMw[unit];
    }

    /**
     * Sets the governor's load reference. Held inside the unit's output range [min, max]; the value
     * actually applied is returned. Ignored (returns 0) for a unit that is tripped or offline.
     */
    public double setLoadReferenceMw(String unitId, double mw) {
        return setLoadReferenceMw(grid.unitIndex(unitId), mw);
    }

    public double setLoadReferenceMw(int unit, double mw) {
        requireFinite(mw, "mw");
        if (!dynamics.online[unit] || dynamics.tripped[unit]) {
            return 0.0;
        }
        double applied = Math.max(dynamics.minMw[unit], Math.min(dynamics.maxMw[unit], mw));
        dynamics.loadReferenceMw[unit] = applied;
        return applied;
    }

    /** Trips the unit: output decays to zero on its trip time constant and stays there. */
    public void trip(String unitId) {
        trip(grid.unitIndex(unitId));
    }

    public void trip(int unit) {
        dynamics.tripped[unit] = true;
        dynamics.loadReferenceMw[unit] = 0.0;
    }

    public boolean isTripped(String unitId) {
        return dynamics.tripped[grid.unitIndex(unitId)];
    }

    public boolean isOnline(String unitId) {
        return dynamics.online[grid.unitIndex(unitId)];
    }

    /** @param unit unit index in the grid (no name look-up: for per-step callers) */
    public boolean isTripped(int unit) {
        return dynamics.tripped[unit];
    }

    /** @param unit unit index in the grid (no name look-up: for per-step callers) */
    public boolean isOnline(int unit) {
        return dynamics.online[unit];
    }

    // ---- for checks and other solvers

    /** @return the right-hand side, for comparing with other integrators */
    public GridDynamics dynamics() {
        return dynamics;
    }

    /** @return a copy of the current state vector (layout in {@link GridDynamics}) */
    public double[] stateCopy() {
        return x.clone();
    }

    private static void requireFinite(double v, String name) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException(name + " must be a finite number, got " + v);
        }
    }
}
