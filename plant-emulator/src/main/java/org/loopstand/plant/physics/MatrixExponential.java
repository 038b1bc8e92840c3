package org.loopstand.plant.physics;

/**
 * e^{Z} of a small dense matrix by scaling and squaring with a Taylor series: Z is scaled by 2^-s until
 * its 1-norm is at most 0.5, where 24 terms leave a truncation error below 1e-30 of the norm, then squared
 * s times. Meant for the few matrices of at most a few dozen rows built once per step size.
 */
final class MatrixExponential {
    private static final int TERMS = 24;

    private MatrixExponential() {
    }

    /** @return e^{z}; {@code z} is square and left unchanged */
    static double[][] of(double[][] z) {
        int n = z.length;
        double norm = 0;
        for (int j = 0; j < n; j++) {
            double col = 0;
            for (double[] row : z) {
                col += Math.abs(row[j]);
            }
            norm = Math.max(norm, col);
        }
        if (!Double.isFinite(norm)) {
            throw new IllegalArgumentException("matrix exponential of a matrix with a non-finite entry");
        }
        int squarings = norm > 0.5 ? (int) Math.ceil(Math.log(norm / 0.5) / Math.log(2)) : 0;
        double scale = Math.scalb(1.0, -squarings);
        double[][] scaled = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                scaled[i][j] = z[i][j] * scale;
            }
        }
        // Horner form of the truncated series: I + Z(I + Z/2(I + Z/3(...)))
        double[][] result = identity(n);
        for (int k = TERMS; k >= 1; k--) {
            double[][] next = multiply(scaled, result);
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    next[i][j] = (i == j ? 1.0 : 0.0) + next[i][j] / k;
                }
            }
            result = next;
        }
        for (int s = 0; s < squarings; s++) {
            result = multiply(result, result);
        }
        return result;
    }

    static double[][] identity(int n) {
        double[][] id = new double[n][n];
        for (int i = 0; i < n; i++) {
            id[i][i] = 1.0;
        }
        return id;
    }

    static double[][] multiply(double[][] a, double[][] b) {
        int n = a.length;
        int m = b[0].length;
        int inner = b.length;
        double[][] c = new double[n][m];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < inner; k++) {
                double aik = a[i][k];
                if (aik == 0) {
                    continue;
                }
                for (int j = 0; j < m; j++) {
                    c[i][j] += aik * b[k][j];
                }
            }
        }
        return c;
    }
}
