package org.loopstand.plant.physics;

import org.hipparchus.linear.MatrixUtils;
import org.hipparchus.linear.RealMatrix;

/**
 * The two-area, non-reheat, primary-control-only model written out independently of the simulator, as
 * in the textbook block diagram (Saadat, ch. 12; Kundur, ch. 11, from memory), in deviations from the
 * operating point. States: Δf1, Δf2 (Hz), ΔP12 (MW), ΔPv1, ΔPm1, ΔPv2, ΔPm2 (MW).
 */
final class TwoAreaLinearModel {
    final double m1 = 2 * 5 * 1000 / 60.0;
    final double m2 = 2 * 4 * 1000 / 60.0;
    final double d1 = 0.6 * 1000 / 60;
    final double d2 = 0.9 * 1000 / 60;
    final double k1 = 1000 / 0.05 / 60;
    final double k2 = 1000 / 0.0625 / 60;
    final double twoPiT;
    final double tg1 = 0.2;
    final double tt1 = 0.5;
    final double tg2 = 0.3;
    final double tt2 = 0.6;

    /** The textbook tie: T = 2.0 pu·1000 MVA/(2π·60 Hz) MW/rad (see {@link TextbookGrids#twoArea()}). */
    TwoAreaLinearModel() {
        this(TextbookGrids.TEXTBOOK_TIE_MW_PER_RAD);
    }

    TwoAreaLinearModel(double synchronizingMwPerRad) {
        twoPiT = 2 * Math.PI * synchronizingMwPerRad;
    }

    /** @return A such that dx/dt = A·x + b·ΔPL1 */
    RealMatrix a() {
        double[][] a = new double[7][7];
        a[0][0] = -d1 / m1;
        a[0][2] = -1 / m1;
        a[0][4] = 1 / m1;
        a[1][1] = -d2 / m2;
        a[1][2] = 1 / m2;
        a[1][6] = 1 / m2;
        a[2][0] = twoPiT;
        a[2][1] = -twoPiT;
        a[3][0] = -k1 / tg1;
        a[3][3] = -1 / tg1;
        a[4][3] = 1 / tt1;
        a[4][4] = -1 / tt1;
        a[5][1] = -k2 / tg2;
        a[5][5] = -1 / tg2;
        a[6][5] = 1 / tt2;
        a[6][6] = -1 / tt2;
        return MatrixUtils.createRealMatrix(a);
    }

    /** @return dx/dt for a load step {@code loadStepMw} in area 1 */
    double[] derivatives(double[] x, double loadStepMw) {
        double[] dx = a().operate(x);
        dx[0] -= loadStepMw / m1;
        return dx;
    }
}
