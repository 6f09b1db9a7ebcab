package org.stillfield.analysis;

import java.util.Locale;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * The kernel on a point set: a regularised inverse of the covariance of the point values.
 *
 * <p><b>Derivation.</b> Let x = U a be the field at P points (3P coordinates), with U_{(p,i),l} =
 * f_l,i(r_p) and independent amplitudes a ~ N(0, D), D = diag(σ_l²). Then Σ = U D Uᵀ has rank M
 * (for 3P ≥ M and U of full column rank) and the mode-space kernel at the points is
 * K = U D⁻¹ Uᵀ / V² ({@link ModeSpaceKernel} with ρ ≡ 1). If the points are an exact quadrature for
 * the modes with cell volume ΔV, i.e. ΔV Σ_p f_l(r_p)·f_l′(r_p) = V δ_ll′ (UᵀU = (V/ΔV) I; true for
 * a cell-centred grid of a box, or a uniform grid of a periodic box, for modes whose indices stay
 * below the grid size, by the discrete orthogonality of the DCT/DST/DFT bases), then Φ = U√(ΔV/V)
 * has orthonormal columns, Σ = (V/ΔV) Φ D Φᵀ, its pseudo-inverse is Σ⁺ = (ΔV/V) Φ D⁻¹ Φᵀ and
 *
 * <pre>
 *   K = U D⁻¹ Uᵀ / V² = Φ D⁻¹ Φᵀ / (V ΔV) = Σ⁺ / ΔV².
 * </pre>
 *
 * This is also what the discretised density says: ½∫∫F K F ≈ ½ΔV² xᵀKx = ½ xᵀΣ⁺x. Without the
 * quadrature property the relation is only approximate.
 *
 * <p><b>From samples.</b> The samples lie in the column space of U, so the sample second moment S
 * has rank min(N, M) there. Truncating its eigen-decomposition to the M leading eigenvectors (the
 * sampled transverse subspace) and inverting gives S⁺_M; with NS ~ Wishart_M(N, Σ) in that
 * subspace, E[(NS)⁻¹] = Σ⁺/(N − M − 1) (inverse-Wishart mean; Anderson, An Introduction to
 * Multivariate Statistical Analysis, source from memory), so K̂ = ((N − M − 1)/N) S⁺_M / ΔV² is
 * unbiased for N &gt; M + 1. The Tikhonov alternative applies the filter λ_i/(λ_i² + λ²) to the
 * eigenvalues λ_i (vanishing on the null space), with the stated λ.
 */
public final class PointSetKernel {
    private PointSetKernel() {
    }

    /** What was inverted and how. */
    public record Result(DMatrixRMaj kernel, int rank, double[] eigenvalues, String method) {
    }

    /**
     * Truncated pseudo-inverse: the {@code rank} largest eigenvalues inverted, the rest dropped.
     *
     * @param covariance symmetric p × p covariance of the point coordinates
     * @param rank number of eigen-directions kept, 1..p (the number of modes M)
     * @param cellVolume ΔV, m³, positive
     * @param samples N for the inverse-Wishart correction (N − rank − 1)/N, or 0 for an exact covariance
     * @return K = factor · Σ⁺_rank / ΔV²
     */
    public static Result truncated(DMatrixRMaj covariance, int rank, double cellVolume, long samples) {
        Objects.requireNonNull(covariance, "covariance");
        int p = covariance.numRows;
        if (covariance.numCols != p) {
            throw new IllegalArgumentException("covariance must be square: " + covariance.numRows + " x " + covariance.numCols);
        }
        if (rank < 1 || rank > p) {
            throw new IllegalArgumentException("rank must lie in 1.." + p + ": " + rank);
        }
        if (!(cellVolume > 0) || !Double.isFinite(cellVolume)) {
            throw new IllegalArgumentException("cellVolume must be positive and finite (m^3): " + cellVolume);
        }
        if (samples != 0 && samples <= rank + 1) {
            throw new IllegalArgumentException("samples must exceed rank + 1 = " + (rank + 1)
                + " for the inverse-Wishart correction: " + samples);
        }
        Eigen e = eigen(covariance);
        double factor = samples == 0 ? 1.0 : (double) (samples - rank - 1) / samples;
        double[] filter = new double[p];
        for (int k = 0; k < rank; k++) {
            int idx = e.order[k];
            double lambda = e.values[idx];
            if (!(lambda > 0)) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "rank %d exceeds the covariance's positive spectrum: eigenvalue %d is %.3g", rank, k + 1, lambda));
            }
            filter[idx] = factor / lambda;
        }
        DMatrixRMaj k = e.apply(filter);
        CommonOps_DDRM.scale(1.0 / (cellVolume * cellVolume), k);
        return new Result(k, rank, e.sorted(), String.format(Locale.ROOT,
            "truncated pseudo-inverse of the %d x %d covariance on its %d leading eigenvectors (eigenvalue ratio kept"
                + " %.3g, first dropped/last kept %.3g), divided by cell volume^2 = %.6g m^6%s", p, p, rank,
            e.values[e.order[rank - 1]] / e.values[e.order[0]],
            rank < p ? e.values[e.order[rank]] / e.values[e.order[rank - 1]] : 0.0, cellVolume * cellVolume,
            samples == 0 ? "" : String.format(Locale.ROOT, ", inverse-Wishart factor (N - M - 1)/N = %.6f", factor)));
    }

    /**
     * Tikhonov-regularised inverse: eigenvalues filtered by λ_i/(λ_i² + λ²).
     *
     * @param covariance symmetric p × p
     * @param lambda the stated λ, (field unit)², positive
     * @param cellVolume ΔV, m³
     * @return K = Σ_i λ_i/(λ_i² + λ²) v_i v_iᵀ / ΔV²
     */
    public static Result tikhonov(DMatrixRMaj covariance, double lambda, double cellVolume) {
        Objects.requireNonNull(covariance, "covariance");
        if (!(lambda > 0) || !Double.isFinite(lambda)) {
            throw new IllegalArgumentException("lambda must be positive and finite: " + lambda);
        }
        if (!(cellVolume > 0) || !Double.isFinite(cellVolume)) {
            throw new IllegalArgumentException("cellVolume must be positive and finite (m^3): " + cellVolume);
        }
        Eigen e = eigen(covariance);
        double[] filter = new double[e.values.length];
        for (int k = 0; k < filter.length; k++) {
            double l = Math.max(0, e.values[k]);
            filter[k] = l / (l * l + lambda * lambda);
        }
        DMatrixRMaj k = e.apply(filter);
        CommonOps_DDRM.scale(1.0 / (cellVolume * cellVolume), k);
        int effective = 0;
        for (double v : e.values) {
            if (v > lambda) {
                effective++;
            }
        }
        return new Result(k, effective, e.sorted(), String.format(Locale.ROOT,
            "Tikhonov filter l/(l^2 + lambda^2) on the eigenvalues of the %d x %d covariance, lambda = %.6g;"
                + " %d eigenvalues above lambda", filter.length, filter.length, lambda, effective));
    }

    /**
     * @param secondMoment row-major p × p, e.g. {@link MomentAccumulator#secondMoment()}
     * @param p its size
     * @return as an EJML matrix, symmetrised
     */
    public static DMatrixRMaj matrix(double[] secondMoment, int p) {
        Objects.requireNonNull(secondMoment, "secondMoment");
        if (secondMoment.length != p * p) {
            throw new IllegalArgumentException("secondMoment must hold p^2 = " + p * p + " values: " + secondMoment.length);
        }
        DMatrixRMaj m = new DMatrixRMaj(p, p);
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < p; j++) {
                m.set(i, j, 0.5 * (secondMoment[i * p + j] + secondMoment[j * p + i]));
            }
        }
        return m;
    }

    private static final class Eigen {
        final double[] values;
        final DMatrixRMaj vectors;
        final int[] order;

        Eigen(double[] values, DMatrixRMaj vectors) {
            this.values = values;
            this.vectors = vectors;
            Integer[] o = new Integer[values.length];
            for (int k = 0; k < o.length; k++) {
                o[k] = k;
            }
            java.util.Arrays.sort(o, (x, y) -> Double.compare(values[y], values[x]));
            order = new int[o.length];
            for (int k = 0; k < o.length; k++) {
                order[k] = o[k];
            }
        }

        double[] sorted() {
            double[] s = new double[values.length];
            for (int k = 0; k < s.length; k++) {
                s[k] = values[order[k]];
            }
            return s;
        }

        /** V diag(filter) Vᵀ. */
        DMatrixRMaj apply(double[] filter) {
            int p = values.length;
            DMatrixRMaj scaled = vectors.copy();
            for (int i = 0; i < p; i++) {
                for (int k = 0; k < p; k++) {
                    scaled.data[i * p + k] *= filter[k];
                }
            }
            DMatrixRMaj out = new DMatrixRMaj(p, p);
            CommonOps_DDRM.multTransB(scaled, vectors, out);
            return out;
        }
    }

    private static Eigen eigen(DMatrixRMaj covariance) {
        int p = covariance.numRows;
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(p, true, true);
        if (!eig.decompose(covariance.copy())) {
            throw new IllegalStateException("eigen-decomposition of the " + p + " x " + p + " covariance failed");
        }
        double[] values = new double[p];
        DMatrixRMaj vectors = new DMatrixRMaj(p, p);
        for (int k = 0; k < p; k++) {
            values[k] = eig.getEigenvalue(k).getReal();
            DMatrixRMaj v = eig.getEigenVector(k);
            for (int i = 0; i < p; i++) {
                vectors.set(i, k, v.get(i, 0));
            }
        }
        return new Eigen(values, vectors);
    }
}
