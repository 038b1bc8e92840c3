package org.loopstand.plant.physics;

import java.util.Arrays;

/**
 * LU decomposition with partial pivoting of a small dense system. An instance keeps the last factorisation and
 * reuses it while the matrix stays the same, so a step whose equations did not change costs one back substitution.
 */
final class LinearSolve {
    private double[][] factored;
    private double[][] lastMatrix;
    private int[] pivot;
    private double[] scratch;

    /** Solves matrix·z = rhs into rhs, refactoring only when the matrix changed since the last call. */
    void solve(double[][] matrix, double[] rhs) {
        int n = rhs.length;
        if (factored == null || !same(matrix)) {
            factored = new double[n][];
            lastMatrix = new double[n][];
            for (int i = 0; i < n; i++) {
                factored[i] = matrix[i].clone();
                lastMatrix[i] = matrix[i].clone();
            }
            pivot = factor(factored);
            scratch = new double[n];
        }
        solve(factored, pivot, rhs, scratch);
    }

    private boolean same(double[][] matrix) {
        for (int i = 0; i < matrix.length; i++) {
            if (!Arrays.equals(matrix[i], lastMatrix[i])) {
                return false;
            }
        }
        return true;
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
