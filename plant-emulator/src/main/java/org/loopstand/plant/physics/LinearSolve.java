package org.loopstand.plant.physics;

/** LU decomposition with partial pivoting of a small dense system, in place. */
final class LinearSolve {
    private LinearSolve() {
    }

    /** Factors {@code a} in place; @return the row permutation */
    static int[] factor(double[][] a) {
        int n = a.length;
        int[] pivot = new int[n];
        for (int i = 0; i < n; i++) {
            pivot[i] = i;
        }
        for (int col = 0; col < n; col++) {
            int best = col;
            for (int r = col + 1; r < n; r++) {
                if (Math.abs(a[r][col]) > Math.abs(a[best][col])) {
                    best = r;
                }
            }
            if (a[best][col] == 0) {
                throw new IllegalStateException("singular network equations at column " + col);
            }
            double[] swap = a[col];
            a[col] = a[best];
            a[best] = swap;
            int p = pivot[col];
            pivot[col] = pivot[best];
            pivot[best] = p;
            for (int r = col + 1; r < n; r++) {
                double factor = a[r][col] / a[col][col];
                a[r][col] = factor;
                for (int c = col + 1; c < n; c++) {
                    a[r][c] -= factor * a[col][c];
                }
            }
        }
        return pivot;
    }

    /** Solves with a factored matrix; {@code b} is replaced by the solution, {@code y} (same length) is scratch. */
    static void solve(double[][] lu, int[] pivot, double[] b, double[] y) {
        int n = b.length;
        for (int i = 0; i < n; i++) {
            double sum = b[pivot[i]];
            for (int c = 0; c < i; c++) {
                sum -= lu[i][c] * y[c];
            }
            y[i] = sum;
        }
        for (int i = n - 1; i >= 0; i--) {
            double sum = y[i];
            for (int c = i + 1; c < n; c++) {
                sum -= lu[i][c] * b[c];
            }
            b[i] = sum / lu[i][i];
        }
    }
}
