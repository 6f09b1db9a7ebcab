package org.stillfield.analysis;

import java.util.Arrays;
import java.util.Locale;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;

/**
 * Streaming mean and full co-moment matrix of a p-dimensional vector, mergeable exactly between
 * parts of an ensemble.
 *
 * <p>State: the count n, the mean μ and the centred co-moment M = Σ_s (x_s − μ)(x_s − μ)ᵀ. Two
 * parts combine with the pairwise update of Chan, Golub &amp; LeVeque ("Updating formulae and a
 * pairwise algorithm for computing sample variances", 1979; "Algorithms for computing the sample
 * variance: analysis and recommendations", Am. Stat. 37, 242 (1983); source from memory):
 *
 * <pre>
 *   n = n_a + n_b,  δ = μ_b − μ_a,  μ = μ_a + δ n_b/n,  M = M_a + M_b + δ δᵀ n_a n_b / n.
 * </pre>
 *
 * A batch is first reduced on its own (two passes: its mean, then its centred co-moment as one
 * symmetric matrix product) and then merged, so the rounding error grows with the number of
 * batches, not of samples. Merging is exact algebra: analysing parts and merging equals analysing
 * the union up to rounding (~1e-14 relative in tests).
 *
 * <p>The fields sampled here have known zero mean, so the natural estimator of the covariance is
 * the raw second moment (1/n) Σ x xᵀ = (M + n μμᵀ)/n ({@link #secondMoment()}); the mean-subtracted
 * (1/(n−1)) M is offered as well ({@link #covariance()}).
 *
 * <p><b>Size limit.</b> The co-moment takes 8p² bytes. Construction refuses p above a stated
 * limit ({@link #DEFAULT_MAX_DIMENSION} unless given), so a mistaken choice of points fails at
 * once with a message instead of exhausting memory. Not thread-safe.
 */
public final class MomentAccumulator {
    /** Default largest dimension p: 3072 coordinates, a 72 MiB co-moment matrix. */
    public static final int DEFAULT_MAX_DIMENSION = 3072;
    /** Hard ceiling on p whatever limit is asked for (8192² doubles = 512 MiB). */
    public static final int CEILING = 8192;

    private final int dim;
    private long n;
    private final double[] mean;
    /** Row-major p × p co-moment, kept symmetric. */
    private final double[] comoment;

    private MomentAccumulator(int dim) {
        this.dim = dim;
        this.mean = new double[dim];
        this.comoment = new double[dim * dim];
    }

    /**
     * @param dimension p, 1 ≤ p ≤ {@link #DEFAULT_MAX_DIMENSION}
     * @return an empty accumulator
     */
    public static MomentAccumulator of(int dimension) {
        return of(dimension, DEFAULT_MAX_DIMENSION);
    }

    /**
     * @param dimension p, 1 ≤ p ≤ maxDimension
     * @param maxDimension the caller's limit on p, 1 ≤ maxDimension ≤ {@link #CEILING}
     * @return an empty accumulator
     * @throws IllegalArgumentException when p exceeds the limit, naming the memory it would take
     */
    public static MomentAccumulator of(int dimension, int maxDimension) {
        if (maxDimension < 1 || maxDimension > CEILING) {
            throw new IllegalArgumentException("maxDimension must lie in 1.." + CEILING + ": " + maxDimension);
        }
        if (dimension < 1) {
            throw new IllegalArgumentException("dimension must be >= 1: " + dimension);
        }
        if (dimension > maxDimension) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "dimension must be at most %d coordinates (points x components) for a full covariance: %d would need"
                    + " a %.0f MiB matrix; choose fewer points or components, or raise the limit", maxDimension,
                dimension, 8.0 * dimension * dimension / (1 << 20)));
        }
        return new MomentAccumulator(dimension);
    }

    /** @return the dimension p */
    public int dimension() {
        return dim;
    }

    /** @return the number of vectors accumulated */
    public long count() {
        return n;
    }

    /**
     * Adds one vector.
     *
     * @param x length p, finite
     */
    public void add(double[] x) {
        addAll(new double[][] {x}, 1);
    }

    /**
     * Adds the first {@code count} rows as one batch.
     *
     * @param rows rows[s] of length ≥ p (only the first p entries are used), finite
     * @param count rows to use, 0 ≤ count ≤ rows.length
     */
    public void addAll(double[][] rows, int count) {
        Objects.requireNonNull(rows, "rows");
        if (count < 0 || count > rows.length) {
            throw new IllegalArgumentException("count must lie in 0.." + rows.length + ": " + count);
        }
        if (count == 0) {
            return;
        }
        double[] bm = new double[dim];
        for (int s = 0; s < count; s++) {
            double[] x = rows[s];
            if (x.length < dim) {
                throw new IllegalArgumentException("rows[" + s + "] must hold at least " + dim + " values: " + x.length);
            }
            for (int k = 0; k < dim; k++) {
                if (!Double.isFinite(x[k])) {
                    throw new IllegalArgumentException("rows[" + s + "][" + k + "] must be finite: " + x[k]);
                }
                bm[k] += x[k];
            }
        }
        for (int k = 0; k < dim; k++) {
            bm[k] /= count;
        }
        DMatrixRMaj centred = new DMatrixRMaj(count, dim);
        double[] cd = centred.data;
        for (int s = 0; s < count; s++) {
            double[] x = rows[s];
            int off = s * dim;
            for (int k = 0; k < dim; k++) {
                cd[off + k] = x[k] - bm[k];
            }
        }
        DMatrixRMaj bc = new DMatrixRMaj(dim, dim);
        // XᵀX of the centred batch; EJML's inner product uses the symmetry of the result.
        CommonOps_DDRM.multInner(centred, bc);
        merge(count, bm, bc.data);
    }

    /**
     * Merges another part into this one (Chan, Golub &amp; LeVeque). The other is not changed.
     *
     * @param other an accumulator of the same dimension
     */
    public void merge(MomentAccumulator other) {
        Objects.requireNonNull(other, "other");
        if (other.dim != dim) {
            throw new IllegalArgumentException("other must have dimension " + dim + ": " + other.dim);
        }
        if (other == this) {
            throw new IllegalArgumentException("other must be a different accumulator (merging a part with itself"
                + " would count its samples twice)");
        }
        merge(other.n, other.mean, other.comoment);
    }

    private void merge(long nb, double[] mb, double[] cb) {
        if (nb == 0) {
            return;
        }
        if (n == 0) {
            n = nb;
            System.arraycopy(mb, 0, mean, 0, dim);
            System.arraycopy(cb, 0, comoment, 0, comoment.length);
            return;
        }
        long total = n + nb;
        double wa = (double) n / total;
        double wb = (double) nb / total;
        double f = (double) n * nb / total;
        double[] delta = new double[dim];
        for (int k = 0; k < dim; k++) {
            delta[k] = mb[k] - mean[k];
        }
        for (int i = 0; i < dim; i++) {
            int row = i * dim;
            double di = f * delta[i];
            for (int j = 0; j < dim; j++) {
                comoment[row + j] += cb[row + j] + di * delta[j];
            }
        }
        for (int k = 0; k < dim; k++) {
            // Weighted form rather than μ_a + δ n_b/n: equal rounding either way, and symmetric in a, b.
            mean[k] = wa * mean[k] + wb * mb[k];
        }
        n = total;
    }

    /** @return a copy of the mean μ */
    public double[] mean() {
        return mean.clone();
    }

    /** @return a copy of the co-moment M = Σ (x − μ)(x − μ)ᵀ, row-major p × p */
    public double[] comoment() {
        return comoment.clone();
    }

    /**
     * @return the raw second moment (1/n) Σ x xᵀ = (M + n μμᵀ)/n, row-major p × p: the unbiased
     *     covariance estimator for fields of known zero mean
     */
    public double[] secondMoment() {
        requireSamples(1);
        double[] out = new double[comoment.length];
        for (int i = 0; i < dim; i++) {
            for (int j = 0; j < dim; j++) {
                out[i * dim + j] = comoment[i * dim + j] / n + mean[i] * mean[j];
            }
        }
        return out;
    }

    /** @return the mean-subtracted sample covariance M/(n − 1), row-major p × p (needs n ≥ 2) */
    public double[] covariance() {
        requireSamples(2);
        double[] out = comoment.clone();
        for (int k = 0; k < out.length; k++) {
            out[k] /= n - 1;
        }
        return out;
    }

    /** @return an independent copy */
    public MomentAccumulator copy() {
        MomentAccumulator c = new MomentAccumulator(dim);
        c.n = n;
        System.arraycopy(mean, 0, c.mean, 0, dim);
        System.arraycopy(comoment, 0, c.comoment, 0, comoment.length);
        return c;
    }

    private void requireSamples(int k) {
        if (n < k) {
            throw new IllegalStateException("needs at least " + k + " accumulated vectors: " + n);
        }
    }

    @Override
    public String toString() {
        return "MomentAccumulator[p=" + dim + ", n=" + n + ", mean=" + Arrays.toString(Arrays.copyOf(mean,
            Math.min(dim, 4))) + (dim > 4 ? "..." : "") + "]";
    }
}
