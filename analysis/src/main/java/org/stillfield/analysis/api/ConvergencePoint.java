package org.stillfield.analysis.api;

/**
 * The error of the correlation estimates after the first N samples.
 *
 * @param samples N
 * @param rmsError root mean square over the tested rows of (Ĉ_N − C)/s₁, with s₁ = √(C_ii C_jj +
 *     C_ij²) the single-sample standard deviation (Isserlis); its expectation squared is exactly 1/N
 * @param expected 1/√N
 * @param rows number of rows averaged
 */
public record ConvergencePoint(long samples, double rmsError, double expected, int rows) {
    /** Validates. */
    public ConvergencePoint {
        if (samples < 1 || !(rmsError >= 0) || !(expected > 0) || rows < 1) {
            throw new IllegalArgumentException(String.format(
                "convergence point needs N >= 1, rms >= 0, rows >= 1: N %d, rms %s, rows %d", samples, rmsError, rows));
        }
    }
}
