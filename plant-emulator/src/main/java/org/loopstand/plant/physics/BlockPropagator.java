package org.loopstand.plant.physics;

/**
 * Exact step of one small linear block {@code dx/dt = A·x + Σ_c B_c·w_c(s)} over a step h, for inputs that are
 * quintic polynomials in the time s since the step start, written {@code w_c(s) = Σ_j w_cj·s^j/j!} (j = 0..5).
 * One exponential of the augmented matrix {@code [[A, B⊗e0, 0], [0, N, 0], [I, 0, 0]]} (N shifts the
 * polynomial terms down one degree, the last block integrates x) gives, all exact:
 * <ul>
 * <li>{@code Φ = e^{Ah}}, {@code Γ_cj = ∫_0^h e^{A(h−s)} B_c s^j/j! ds}: the state at the step's end;</li>
 * <li>{@code Ψ = ∫_0^h e^{As} ds}, {@code Λ_cj = ∫_0^h x-response to s^j/j! ds}: the state's integral over the step,
 *     used here only through the output row p (the block's power, MW·s);</li>
 * <li>the power's rate {@code p·dx/ds} at the step's start and end ({@code p·(A·x + B·w)}), for the network equations
 *     of {@link AreaEquations}, which match the areas' Δf'' at both ends.</li>
 * </ul>
 */
final class BlockPropagator {
    /** number of polynomial terms per input: constant, s, s²/2, …, s⁵/120 */
    static final int TERMS = 6;

    final int n;
    final int inputs;
    /** p: the block's power from its state */
    final double[] out;
    /** Φ, row-major n×n */
    final double[] phi;
    /** Γ, row-major n×(inputs·TERMS), column c·TERMS + j */
    final double[] gamma;
    /** p·Φ */
    final double[] outEnd;
    /** p·Γ, per column */
    final double[] outEndInput;
    /** p·Ψ */
    final double[] outIntegral;
    /** p·Λ, per column */
    final double[] outIntegralInput;
    /** p·A: the power's rate at the step's start from the state */
    final double[] outSlope;
    /** p·B_c: the power's rate at the start from input c's constant term (the other terms are 0 at s = 0) */
    final double[] outSlopeInput;
    /** p·A·Φ: the power's rate at the step's end from the start state */
    final double[] outSlopeEnd;
    /** p·A·Γ_cj + p·B_c·h^j/j!: the power's rate at the end from each input term, per column */
    final double[] outSlopeEndInput;

    /**
     * @param a      n×n state matrix, 1/s
     * @param b      n×inputs input matrix
     * @param p      output row (power of the block)
     * @param stepS  step h, s
     */
    BlockPropagator(double[][] a, double[][] b, double[] p, double stepS) {
        n = a.length;
        inputs = b[0].length;
        out = p.clone();
        int cols = inputs * TERMS;
        int size = n + cols + n;
        double[][] z = new double[size][size];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                z[i][j] = a[i][j] * stepS;
            }
            for (int c = 0; c < inputs; c++) {
                z[i][n + c * TERMS] = b[i][c] * stepS;
            }
            z[n + cols + i][i] = stepS;
        }
        for (int c = 0; c < inputs; c++) {
            for (int j = 0; j + 1 < TERMS; j++) {
                z[n + c * TERMS + j][n + c * TERMS + j + 1] = stepS;
            }
        }
        double[][] e = MatrixExponential.of(z);
        phi = new double[n * n];
        gamma = new double[n * cols];
        outEnd = new double[n];
        outEndInput = new double[cols];
        outIntegral = new double[n];
        outIntegralInput = new double[cols];
        outSlope = new double[n];
        outSlopeInput = new double[inputs];
        outSlopeEnd = new double[n];
        outSlopeEndInput = new double[cols];
        double[] pa = new double[n];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < n; k++) {
                pa[i] += p[k] * a[k][i];
            }
            outSlope[i] = pa[i];
            for (int c = 0; c < inputs; c++) {
                outSlopeInput[c] += p[i] * b[i][c];
            }
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                phi[i * n + j] = e[i][j];
                outEnd[j] += p[i] * e[i][j];
                outIntegral[j] += p[i] * e[n + cols + i][j];
            }
            for (int k = 0; k < cols; k++) {
                gamma[i * cols + k] = e[i][n + k];
                outEndInput[k] += p[i] * e[i][n + k];
                outIntegralInput[k] += p[i] * e[n + cols + i][n + k];
            }
            for (int j = 0; j < n; j++) {
                outSlopeEnd[j] += pa[i] * e[i][j];
            }
            for (int k = 0; k < cols; k++) {
                outSlopeEndInput[k] += pa[i] * e[i][n + k];
            }
        }
        for (int c = 0; c < inputs; c++) {
            double term = 1;
            for (int j = 0; j < TERMS; j++) {
                outSlopeEndInput[c * TERMS + j] += outSlopeInput[c] * term;
                term *= stepS / (j + 1);
            }
        }
    }
}
