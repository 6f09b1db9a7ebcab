package org.stillfield.analysis;

import java.util.Objects;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * Mardia's multivariate skewness and kurtosis (Mardia, "Measures of multivariate skewness and
 * kurtosis with applications", Biometrika 57, 519 (1970); source from memory). With the sample
 * mean x̄ and the covariance S = (1/n) Σ (x − x̄)(x − x̄)ᵀ,
 *
 * <pre>
 *   b₁ = (1/n²) Σ_i Σ_j [(x_i − x̄)ᵀ S⁻¹ (x_j − x̄)]³,   b₂ = (1/n) Σ_i [(x_i − x̄)ᵀ S⁻¹ (x_i − x̄)]².
 * </pre>
 *
 * Under normality n b₁/6 is asymptotically χ² with p(p+1)(p+2)/6 degrees of freedom and b₂ is
 * asymptotically normal with mean p(p+2) and variance 8p(p+2)/n. b₁ is computed as the squared
 * norm of the third-moment tensor of the whitened data, Σ_{rst} ((1/n)Σ_i z_ir z_is z_it)², which
 * equals the double sum (O(n p³) instead of O(n² p)).
 */
public final class Mardia {
    private Mardia() {
    }

    /**
     * @param b1 skewness b₁
     * @param b2 kurtosis b₂
     * @param skewnessP P(χ²_df ≥ n b₁/6)
     * @param kurtosisZ (b₂ − p(p+2))/√(8p(p+2)/n)
     * @param kurtosisP two-sided normal p-value of kurtosisZ
     * @param n sample size
     * @param p dimension
     */
    public record Result(double b1, double b2, double skewnessP, double kurtosisZ, double kurtosisP, int n, int p) {
    }

    /**
     * @param x x[i] is observation i, all of length p ≥ 1; n &gt; p + 1; S must be positive definite
     * @return b₁, b₂ and their p-values
     */
    public static Result test(double[][] x) {
        Objects.requireNonNull(x, "x");
        int n = x.length;
        if (n < 3) {
            throw new IllegalArgumentException("x must hold at least 3 observations: " + n);
        }
        int p = x[0].length;
        if (p < 1 || n <= p + 1) {
            throw new IllegalArgumentException("x must have dimension >= 1 and more than p + 1 = " + (p + 1)
                + " observations: " + n);
        }
        double[] mean = new double[p];
        for (double[] row : x) {
            if (row.length != p) {
                throw new IllegalArgumentException("every observation must have dimension " + p + ": " + row.length);
            }
            for (int k = 0; k < p; k++) {
                mean[k] += row[k] / n;
            }
        }
        DMatrixRMaj y = new DMatrixRMaj(n, p);
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < p; k++) {
                y.set(i, k, x[i][k] - mean[k]);
            }
        }
        DMatrixRMaj s = new DMatrixRMaj(p, p);
        CommonOps_DDRM.multInner(y, s);
        CommonOps_DDRM.scale(1.0 / n, s);
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(p, true);
        if (!chol.decompose(s)) {
            throw new IllegalArgumentException("the sample covariance of x must be positive definite (are some"
                + " coordinates identically zero or linearly dependent?)");
        }
        DMatrixRMaj l = chol.getT(null);
        DMatrixRMaj lInv = new DMatrixRMaj(p, p);
        if (!CommonOps_DDRM.invert(l, lInv)) {
            throw new IllegalArgumentException("the sample covariance of x is numerically singular");
        }
        // z_i = L⁻¹ y_i, i.e. Z = Y L⁻ᵀ.
        DMatrixRMaj z = new DMatrixRMaj(n, p);
        CommonOps_DDRM.multTransB(y, lInv, z);
        double[] m3 = new double[p * p * p];
        double b2 = 0;
        for (int i = 0; i < n; i++) {
            double d2 = 0;
            for (int r = 0; r < p; r++) {
                double zr = z.get(i, r);
                d2 += zr * zr;
                for (int s2 = 0; s2 < p; s2++) {
                    double zrs = zr * z.get(i, s2);
                    int off = (r * p + s2) * p;
                    for (int t = 0; t < p; t++) {
                        m3[off + t] += zrs * z.get(i, t);
                    }
                }
            }
            b2 += d2 * d2;
        }
        b2 /= n;
        double b1 = 0;
        for (double v : m3) {
            b1 += (v / n) * (v / n);
        }
        double df = p * (p + 1.0) * (p + 2.0) / 6.0;
        ChiSquaredDistribution chi = new ChiSquaredDistribution(null, df);
        double skewP = 1.0 - chi.cumulativeProbability(n * b1 / 6.0);
        double kz = (b2 - p * (p + 2.0)) / Math.sqrt(8.0 * p * (p + 2.0) / n);
        NormalDistribution normal = new NormalDistribution(null, 0, 1);
        double kp = 2 * normal.cumulativeProbability(-Math.abs(kz));
        return new Result(b1, b2, Math.max(0, skewP), kz, kp, n, p);
    }
}
