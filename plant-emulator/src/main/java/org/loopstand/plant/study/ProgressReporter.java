package org.loopstand.plant.study;

import java.io.PrintStream;

/** Shows how far a study has come. {@link #NONE} when output is not a terminal. */
public interface ProgressReporter {
    ProgressReporter NONE = new ProgressReporter() {
        @Override
        public void update(double simulatedS, double totalS, double wallS) {
        }

        @Override
        public void done(double simulatedS, double wallS) {
        }
    };

    /** Called often; implementations decide how often to redraw. */
    void update(double simulatedS, double totalS, double wallS);

    void done(double simulatedS, double wallS);

    /** A one-line bar redrawn with '\r', at most five times per wall second. */
    static ProgressReporter terminal(PrintStream out) {
        return new ProgressReporter() {
            private double lastDrawWallS = -1;

            @Override
            public void update(double simulatedS, double totalS, double wallS) {
                if (wallS - lastDrawWallS < 0.2) {
                    return;
                }
                lastDrawWallS = wallS;
                int width = 30;
                int filled = (int) Math.min(width, Math.round(width * simulatedS / totalS));
                out.printf(java.util.Locale.ROOT, "\r[%s%s] %.0f / %.0f s simulated, %.0fx real time ",
                        "#".repeat(filled), " ".repeat(width - filled), simulatedS, totalS,
                        wallS > 0 ? simulatedS / wallS : 0.0);
                out.flush();
            }

            @Override
            public void done(double simulatedS, double wallS) {
                out.printf(java.util.Locale.ROOT, "\r%.0f s simulated in %.2f s wall time (%.0fx real time)%s%n",
                        simulatedS, wallS, wallS > 0 ? simulatedS / wallS : 0.0, " ".repeat(20));
            }
        };
    }
}
