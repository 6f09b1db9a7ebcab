package org.stillfield.analysis.spectra;

import java.util.Objects;

/**
 * Ensemble estimate of the two-time correlation C_xy(τ_j) = ⟨x(t+τ_j) y(t)⟩ at lags τ_j = j Δt,
 * j = 0 … J. For a Wigner-sampled ensemble evolved by linear dynamics the classical average equals
 * the symmetrised quantum correlation ½⟨{x̂(t+τ), ŷ(t)}⟩ (PHYSICS.md §2, §5).
 *
 * <p>Each series (ensemble sample) gives one value per lag: x(τ_j)·y(0) for {@link Origins#FIRST},
 * or the average of x(t_n + τ_j) y(t_n) over every origin n with n + j inside the series for
 * {@link Origins#ALL} (stationary processes). The estimate is the mean over series, its standard
 * error the spread of the per-series values over √S — valid whatever the correlation inside one
 * series, since the series are independent. Not thread-safe.
 */
public final class TwoTimeCorrelation {
    /** Which time origins a series contributes. */
    public enum Origins {
        /** Only t = 0: a pure ensemble average, for any (also non-stationary) process. */
        FIRST,
        /** Every origin: uses stationarity to average along each series too. */
        ALL
    }

    private final int maxLag;
    private final double dt;
    private final Origins origins;
    private final double[] mean;
    private final double[] m2;
    private long count;

    private TwoTimeCorrelation(int maxLag, double dt, Origins origins) {
        this.maxLag = maxLag;
        this.dt = dt;
        this.origins = origins;
        mean = new double[maxLag + 1];
        m2 = new double[maxLag + 1];
    }

    /**
     * @param maxLag largest lag J in steps, ≥ 0
     * @param dtSeconds step, s
     * @param origins which origins to use
     * @return an empty estimator
     */
    public static TwoTimeCorrelation of(int maxLag, double dtSeconds, Origins origins) {
        if (maxLag < 0) {
            throw new IllegalArgumentException("max lag must be >= 0 steps: " + maxLag);
        }
        if (!(dtSeconds > 0) || !Double.isFinite(dtSeconds)) {
            throw new IllegalArgumentException("dt_s must be positive and finite (seconds): " + dtSeconds);
        }
        return new TwoTimeCorrelation(maxLag, dtSeconds, Objects.requireNonNull(origins, "origins"));
    }

    /**
     * @param x series of the later factor, length ≥ J + 1
     * @param y series of the earlier factor, same length
     */
    public void add(double[] x, double[] y) {
        if (x.length != y.length) {
            throw new IllegalArgumentException("series must have equal length: " + x.length + " vs " + y.length);
        }
        if (x.length <= maxLag) {
            throw new IllegalArgumentException("series of " + x.length + " steps is too short for max lag " + maxLag);
        }
        count++;
        for (int j = 0; j <= maxLag; j++) {
            double v;
            if (origins == Origins.FIRST) {
                v = x[j] * y[0];
            } else {
                double s = 0;
                int n = x.length - j;
                for (int i = 0; i < n; i++) {
                    s += x[i + j] * y[i];
                }
                v = s / n;
            }
            // Welford's update: stable mean and sum of squared deviations.
            double d = v - mean[j];
            mean[j] += d / count;
            m2[j] += d * (v - mean[j]);
        }
    }

    /** @return series added */
    public long count() {
        return count;
    }

    /** @return lags τ_j, s */
    public double[] lags() {
        double[] t = new double[maxLag + 1];
        for (int j = 0; j <= maxLag; j++) {
            t[j] = j * dt;
        }
        return t;
    }

    /** @return Ĉ(τ_j), mean over series */
    public double[] mean() {
        return mean.clone();
    }

    /** @return standard error of Ĉ(τ_j) from the spread over series (needs ≥ 2 series) */
    public double[] standardError() {
        if (count < 2) {
            throw new IllegalStateException("standard error needs at least 2 series, have " + count);
        }
        double[] se = new double[maxLag + 1];
        for (int j = 0; j <= maxLag; j++) {
            se[j] = Math.sqrt(m2[j] / (count - 1) / count);
        }
        return se;
    }
}
