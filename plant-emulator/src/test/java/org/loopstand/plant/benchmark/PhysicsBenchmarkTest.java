package org.loopstand.plant.benchmark;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.hipparchus.ode.ODEState;
import org.hipparchus.ode.OrdinaryDifferentialEquation;
import org.hipparchus.ode.nonstiff.DormandPrince853Integrator;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridDynamics;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.Integrator;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.time.SystemTime;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * Speed of the physics, not a check: prints figures and writes target/benchmark-physics.txt. Excluded from
 * the normal build; run it with the command in docs/performance.md.
 */
@Tag("benchmark")
class PhysicsBenchmarkTest {
    private final List<String> report = new ArrayList<>();

    @Test
    void shouldMeasureSimulatedSecondsPerWallSecond() throws IOException {
        Grid demo = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        Grid large = GeneratedSite.build(20, 50, 20, 900);
        line("RK4 fixed step, load noise on:");
        speed("demo-site (2 areas, 6 units)", demo, 20_000);
        speed("generated (20 areas, 1000 units, 30 ties)", large, 600);

        String demoNoiseFree = Files.readString(Path.of("..", "config", "sites", "demo-site.yaml"))
                .replaceAll("noiseSigmaMw: [0-9.]+", "noiseSigmaMw: 0")
                .replaceAll("deadBandHz: [0-9.]+", "deadBandHz: 0")
                .replaceAll(" *(raise|lower)RateMwPerMin: [0-9.]+\\n", "");
        Grid demoQuiet = SiteLoader.load("demo-site (no noise)", new java.io.StringReader(demoNoiseFree));
        line("RK4 against Hipparchus Dormand-Prince 8(5,3) at equal accuracy (linear configuration: no noise, dead band or rate limit;"
                + " 100 MW step in the first area, 60 s):");
        equalAccuracy("demo-site", demoQuiet, demoQuiet.areas().get(0).id(), 60, 20);
        Grid largeQuiet = GeneratedSite.build(20, 50, 0, Double.POSITIVE_INFINITY);
        equalAccuracy("generated 1000 units", largeQuiet, "area-0", 60, 3);
        Files.write(Path.of("target", "benchmark-physics.txt"), report, StandardCharsets.UTF_8);
    }

    private void speed(String name, Grid grid, double simulatedS) {
        for (int warm = 0; warm < 2; warm++) {
            run(grid, simulatedS / 4);
        }
        double best = 0;
        for (int rep = 0; rep < 3; rep++) {
            best = Math.max(best, run(grid, simulatedS));
        }
        line(String.format(Locale.ROOT, "  %-45s step %.3f s: %,.0f simulated s per wall s (best of 3, %.0f s simulated)",
                name, new GridSimulator(grid).stepS(), best, simulatedS));
    }

    private static double run(Grid grid, double simulatedS) {
        GridSimulator sim = new GridSimulator(grid, new GridSimulator(grid).stepS(), 1, 12);
        sim.stepLoadMw(grid.areas().get(0).id(), 50);
        long start = SystemTime.wallMonotonicNanos();
        sim.advanceTo(simulatedS);
        double wallS = (SystemTime.wallMonotonicNanos() - start) / 1e9;
        if (!Double.isFinite(sim.frequencyHz(0))) {
            throw new IllegalStateException("diverged");
        }
        return simulatedS / wallS;
    }

    private void equalAccuracy(String name, Grid grid, String stepArea, double durationS, int repeats) {
        GridSimulator rk4 = new GridSimulator(grid);
        rk4.stepLoadMw(stepArea, 100);
        double[] x0 = rk4.stateCopy();
        OrdinaryDifferentialEquation ode = asOde(rk4.dynamics());
        double[] reference = dormandPrince(ode, x0, durationS, 1e-12);
        int areas = grid.areas().size();

        long start = SystemTime.wallMonotonicNanos();
        double[] rk4End = null;
        for (int r = 0; r < repeats; r++) {
            GridSimulator sim = new GridSimulator(grid);
            sim.stepLoadMw(stepArea, 100);
            sim.advanceTo(durationS);
            rk4End = sim.stateCopy();
        }
        double rk4WallS = (SystemTime.wallMonotonicNanos() - start) / 1e9 / repeats;
        double rk4ErrorHz = maxFrequencyError(rk4End, reference, areas);

        double tolerance = 1e-3;
        double[] dp = dormandPrince(ode, x0, durationS, tolerance);
        while (maxFrequencyError(dp, reference, areas) > rk4ErrorHz && tolerance > 1e-14) {
            tolerance /= 2;
            dp = dormandPrince(ode, x0, durationS, tolerance);
        }
        start = SystemTime.wallMonotonicNanos();
        for (int r = 0; r < repeats; r++) {
            dp = dormandPrince(ode, x0, durationS, tolerance);
        }
        double dpWallS = (SystemTime.wallMonotonicNanos() - start) / 1e9 / repeats;
        line(String.format(Locale.ROOT, "  %-22s RK4 h=%.3f s: error %.2e Hz, %.4f s wall | DP853 tol %.1e: error %.2e Hz, "
                        + "%.4f s wall | RK4 is %.1fx faster", name, rk4.stepS(), rk4ErrorHz, rk4WallS, tolerance,
                maxFrequencyError(dp, reference, areas), dpWallS, dpWallS / rk4WallS));
    }

    private static OrdinaryDifferentialEquation asOde(GridDynamics dynamics) {
        return new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return dynamics.dimension();
            }

            @Override
            public double[] computeDerivatives(double t, double[] y) {
                double[] dy = new double[y.length];
                dynamics.derivatives(t, y, dy);
                return dy;
            }
        };
    }

    @Test
    void shouldCompareTheExactIntegratorWithRk4AtEqualAccuracy() throws IOException {
        Grid quiet = GeneratedSite.build(20, 50, 0, Double.POSITIVE_INFINITY);
        double durationS = 60;
        GridSimulator probe = new GridSimulator(quiet);
        probe.stepLoadMw("area-0", 100);
        double[] reference = dormandPrince(asOde(probe.dynamics()), probe.stateCopy(), durationS, 1e-12);
        line("Exact discretisation against RK4, generated site (20 areas, 1000 units), linear configuration, 100 MW step"
                + " in area-0, 60 s, error of the end state's frequencies against DP853 at 1e-12:");
        for (Integrator integrator : Integrator.values()) {
            // compiled code for both paths before any figure is taken (one run per timing is not enough warm-up)
            timedRun(GeneratedSite.build(20, 50, 20, 60), 0.02, integrator, "area-0", 1500, durationS, null, 3);
        }
        // RK4 and every exact step timed in turn, round after round, so that a burst of other work on the shared
        // machine does not fall on one of them only; each figure is the best of its rounds
        double[] steps = {0.02, 0.24, 0.2, 0.16, 0.15, 0.12, 0.1, 0.08, 0.05, 0.04, 0.025, 0.02};
        Integrator[] integrators = new Integrator[steps.length];
        Arrays.fill(integrators, Integrator.EXACT);
        integrators[0] = Integrator.RK4;
        double[][] runs = interleaved(quiet, steps, integrators, "area-0", 100, durationS, reference, 7);
        double[] rk4 = runs[0];
        line(String.format(Locale.ROOT, "  RK4   h=0.020 s: error %.2e Hz, %.4f s wall (best of 7 rounds)", rk4[0], rk4[1]));
        double bestStepS = 0;
        double bestWallS = Double.NaN;
        for (int i = 1; i < steps.length; i++) {
            double[] exact = runs[i];
            line(String.format(Locale.ROOT, "  exact h=%.3f s: error %.2e Hz (%.2fx RK4's), %.4f s wall (%.1fx RK4's speed)",
                    steps[i], exact[0], exact[0] / rk4[0], exact[1], rk4[1] / exact[1]));
            if (bestStepS == 0 && exact[0] <= rk4[0]) {
                bestStepS = steps[i];
                bestWallS = exact[1];
            }
        }
        line(String.format(Locale.ROOT, "  at equal accuracy (largest exact step no less accurate than RK4): h=%.3f s,"
                + " %.1fx RK4's speed", bestStepS, rk4[1] / bestWallS));

        Grid different = GeneratedSite.build(20, 50, 0, Double.POSITIVE_INFINITY, true);
        GridSimulator differentProbe = new GridSimulator(different);
        differentProbe.stepLoadMw("area-0", 100);
        double[] differentReference = dormandPrince(asOde(differentProbe.dynamics()), differentProbe.stateCopy(), durationS,
                1e-12);
        line("The same with no two units alike in an area (governor time constants and droops spread), best of 5 rounds:");
        double[] differentSteps = {0.02, 0.2, 0.16, 0.12, 0.02};
        Integrator[] differentIntegrators = new Integrator[differentSteps.length];
        Arrays.fill(differentIntegrators, Integrator.EXACT);
        differentIntegrators[0] = Integrator.RK4;
        double[][] differentRuns = interleaved(different, differentSteps, differentIntegrators, "area-0", 100, durationS,
                differentReference, 5);
        line(String.format(Locale.ROOT, "  RK4   h=0.020 s: error %.2e Hz, %.4f s wall", differentRuns[0][0],
                differentRuns[0][1]));
        for (int i = 1; i < differentSteps.length; i++) {
            line(String.format(Locale.ROOT, "  exact h=%.3f s: error %.2e Hz, %.4f s wall (%.1fx RK4's speed)",
                    differentSteps[i], differentRuns[i][0], differentRuns[i][1], differentRuns[0][1] / differentRuns[i][1]));
        }

        Grid limited = GeneratedSite.build(20, 50, 0, 60);
        GridSimulator fine = new GridSimulator(limited, 0.001, 0, 12, Integrator.RK4);
        fine.stepLoadMw("area-0", 1500);
        fine.advanceTo(durationS);
        double[] fineEnd = fine.stateCopy();
        line("Rate limits engaged (60 MW/min per unit, 1500 MW step in area-0, 60 s), error against RK4 at h = 1 ms"
                + " (best of 5 rounds):");
        double[] limitedSteps = {0.02, 0.16, 0.1, 0.05, 0.02};
        Integrator[] limitedIntegrators = new Integrator[limitedSteps.length];
        Arrays.fill(limitedIntegrators, Integrator.EXACT);
        limitedIntegrators[0] = Integrator.RK4;
        double[][] limitedRuns = interleaved(limited, limitedSteps, limitedIntegrators, "area-0", 1500, durationS, fineEnd, 5);
        line(String.format(Locale.ROOT, "  RK4   h=0.020 s: error %.2e Hz, %.4f s wall", limitedRuns[0][0], limitedRuns[0][1]));
        for (int i = 1; i < limitedSteps.length; i++) {
            line(String.format(Locale.ROOT, "  exact h=%.3f s: error %.2e Hz, %.4f s wall (%.1fx RK4's speed)", limitedSteps[i],
                    limitedRuns[i][0], limitedRuns[i][1], limitedRuns[0][1] / limitedRuns[i][1]));
        }
        Grid noisy = GeneratedSite.build(20, 50, 20, 900);
        line("Speed with load noise and rate limits (the site of the first benchmark), 600 s, best of 3 rounds:");
        double[][] noisyRuns = interleaved(noisy, new double[] {0.02, 0.02, 0.1},
                new Integrator[] {Integrator.RK4, Integrator.EXACT, Integrator.EXACT}, "area-0", 50, 600, null, 3);
        line(String.format(Locale.ROOT, "  rk4   h=0.020 s: %,.0f simulated s per wall s", 600 / noisyRuns[0][1]));
        line(String.format(Locale.ROOT, "  exact h=0.020 s: %,.0f simulated s per wall s", 600 / noisyRuns[1][1]));
        line(String.format(Locale.ROOT, "  exact h=0.100 s: %,.0f simulated s per wall s", 600 / noisyRuns[2][1]));
        Files.write(Path.of("target", "benchmark-exact.txt"), report, StandardCharsets.UTF_8);
    }

    /** @return per configuration {worst end-state frequency error against {@code reference}, best wall time, s} */
    private static double[][] interleaved(Grid grid, double[] steps, Integrator[] integrators, String stepArea,
            double stepMw, double durationS, double[] reference, int rounds) {
        double[][] result = new double[steps.length][2];
        for (double[] r : result) {
            r[1] = Double.POSITIVE_INFINITY;
        }
        for (int round = 0; round < rounds; round++) {
            for (int i = 0; i < steps.length; i++) {
                double[] one = timedRun(grid, steps[i], integrators[i], stepArea, stepMw, durationS, reference, 1);
                result[i][0] = one[0];
                result[i][1] = Math.min(result[i][1], one[1]);
            }
        }
        return result;
    }

    /** @return {worst end-state frequency error against {@code reference} (0 without one), best wall time of the repeats, s} */
    private static double[] timedRun(Grid grid, double stepS, Integrator integrator, String stepArea, double stepMw,
            double durationS, double[] reference, int repeats) {
        double bestWallS = Double.POSITIVE_INFINITY;
        double[] end = null;
        for (int r = 0; r < repeats + 1; r++) {
            GridSimulator sim = new GridSimulator(grid, stepS, 1, 12, integrator);
            sim.stepLoadMw(stepArea, stepMw);
            long start = SystemTime.wallMonotonicNanos();
            sim.advanceTo(durationS);
            double wallS = (SystemTime.wallMonotonicNanos() - start) / 1e9;
            if (r > 0) {
                bestWallS = Math.min(bestWallS, wallS);
            }
            end = sim.stateCopy();
        }
        double error = reference == null ? 0 : maxFrequencyError(end, reference, grid.areas().size());
        return new double[] {error, bestWallS};
    }

    private static double[] dormandPrince(OrdinaryDifferentialEquation ode, double[] x0, double durationS, double tolerance) {
        DormandPrince853Integrator integrator = new DormandPrince853Integrator(1e-14, 5.0, tolerance, tolerance);
        return integrator.integrate(ode, new ODEState(0, x0.clone()), durationS).getPrimaryState();
    }

    private static double maxFrequencyError(double[] x, double[] reference, int areas) {
        double worst = 0;
        for (int a = 0; a < areas; a++) {
            worst = Math.max(worst, Math.abs(x[a] - reference[a]));
        }
        return worst;
    }

    private void line(String s) {
        System.out.println(s);
        report.add(s);
    }
}
