package org.loopstand.controller.regulation;

import java.util.ArrayList;
import java.util.List;

/**
 * Regulation settings of one area. Build with {@link #builder()}.
 *
 * @param cycleS              control cycle, s, in [0.5, 60], default 4
 * @param filterTimeConstantS ACE filter time constant, s, in [0, 600], default 8
 * @param kp                  proportional gain, MW/MW, in [0, 5], default 0.3
 * @param integralTimeS       integral time, s, in [1, 3600], default 60
 * @param quietMw             quiet band half width, MW, ≥ 0, default 5
 * @param assistMw            assist band threshold, MW, &gt; quietMw, default 200
 */
public record RegulationSettings(double cycleS, double filterTimeConstantS, double kp, double integralTimeS,
                                 double quietMw, double assistMw) {

    public static Builder builder() {
        return new Builder();
    }

    public AceBands bands() {
        return new AceBands(quietMw, assistMw);
    }

    public static final class Builder {
        private double cycleS = 4.0;
        private double filterTimeConstantS = 8.0;
        private double kp = 0.3;
        private double integralTimeS = 60.0;
        private double quietMw = 5.0;
        private double assistMw = 200.0;

        public Builder cycleS(double v) { cycleS = v; return this; }
        public Builder filterTimeConstantS(double v) { filterTimeConstantS = v; return this; }
        public Builder kp(double v) { kp = v; return this; }
        public Builder integralTimeS(double v) { integralTimeS = v; return this; }
        public Builder quietMw(double v) { quietMw = v; return this; }
        public Builder assistMw(double v) { assistMw = v; return this; }

        public RegulationSettings build() {
            List<String> p = new ArrayList<>();
            range(p, "cycleS", cycleS, 0.5, 60);
            range(p, "filterTimeConstantS", filterTimeConstantS, 0, 600);
            range(p, "kp", kp, 0, 5);
            range(p, "integralTimeS", integralTimeS, 1, 3600);
            if (!(quietMw >= 0) || !Double.isFinite(quietMw)) {
                p.add("quietMw must be >= 0, was " + quietMw);
            }
            if (!(assistMw > quietMw) || !Double.isFinite(assistMw)) {
                p.add("assistMw must be > quietMw (" + quietMw + "), was " + assistMw);
            }
            if (!p.isEmpty()) {
                throw new IllegalArgumentException("regulation settings invalid: " + String.join("; ", p));
            }
            return new RegulationSettings(cycleS, filterTimeConstantS, kp, integralTimeS, quietMw, assistMw);
        }

        private static void range(List<String> p, String name, double v, double lo, double hi) {
            if (!(v >= lo && v <= hi)) {
                p.add(name + " must be in [" + lo + ", " + hi + "], was " + v);
            }
        }
    }
}
