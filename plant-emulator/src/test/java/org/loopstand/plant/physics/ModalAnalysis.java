package org.loopstand.plant.physics;

import org.hipparchus.complex.Complex;
import org.hipparchus.linear.EigenDecompositionNonSymmetric;
import org.hipparchus.linear.MatrixUtils;

/** Eigenvalues of a simulator's right-hand side, linearised numerically at its initial operating point. */
final class ModalAnalysis {
    private ModalAnalysis() {
    }

    static Complex[] eigenvalues(GridSimulator sim) {
        GridDynamics dynamics = sim.dynamics();
        int n = dynamics.dimension();
        double[] x0 = sim.stateCopy();
        double[] f0 = new double[n];
        double[] f1 = new double[n];
        double[] fm = new double[n];
        double[][] jacobian = new double[n][n];
        for (int j = 0; j < n; j++) {
            double eps = 1e-4 * Math.max(1.0, Math.abs(x0[j])) * 1e-2;
            double[] xp = x0.clone();
            double[] xm = x0.clone();
            xp[j] += eps;
            xm[j] -= eps;
            dynamics.derivatives(0, xp, f1);
            dynamics.derivatives(0, xm, fm);
            for (int i = 0; i < n; i++) {
                jacobian[i][j] = (f1[i] - fm[i]) / (2 * eps);
            }
        }
        dynamics.derivatives(0, x0, f0);
        return new EigenDecompositionNonSymmetric(MatrixUtils.createRealMatrix(jacobian)).getEigenvalues();
    }
}
