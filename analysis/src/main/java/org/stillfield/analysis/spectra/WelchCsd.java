package org.stillfield.analysis.spectra;

import java.util.Objects;
import java.util.function.IntToDoubleFunction;

/**
 * Welch estimate of the cross-spectral density of two simultaneously sampled series, with the
 * same window, overlap and normalisation as {@link WelchPsd}. Not thread-safe.
 */
public final class WelchCsd {
    private final HannWelch core;

    private WelchCsd(HannWelch core) {
        this.core = core;
    }

    /**
     * @param segmentLength L, a power of two ≥ 4
     * @param dtSeconds sampling step, s
     * @param detrend what to remove from each segment
     * @return an empty estimator
     */
    public static WelchCsd of(int segmentLength, double dtSeconds, Detrend detrend) {
        Objects.requireNonNull(detrend, "detrend");
        return new WelchCsd(new HannWelch(segmentLength, dtSeconds, detrend == Detrend.MEAN));
    }

    /**
     * @param x first series
     * @param y second series, same length and times
     */
    public void add(double[] x, double[] y) {
        core.addCross(x, y);
    }

    /** @return the estimate over everything added */
    public CsdEstimate estimate() {
        core.requireData();
        int bins = core.aa.length;
        double[] re = new double[bins];
        double[] im = new double[bins];
        double[] gx = new double[bins];
        double[] gy = new double[bins];
        for (int k = 0; k < bins; k++) {
            double c = core.scale(k);
            re[k] = c * core.abRe[k];
            im[k] = c * core.abIm[k];
            gx[k] = c * core.aa[k];
            gy[k] = c * core.bb[k];
        }
        return new CsdEstimate(core.frequencies(), re, im, gx, gy, core.binDof(), core.segments,
            1.0 / (core.length * core.dt));
    }

    /**
     * Expectation of the estimator from the cross-covariance at integer lags r(τ) = E[x_n y_{n+τ}]:
     * E[G_k] = c_k Δt/U Σ_{|τ|&lt;L} a(τ) r(τ) e^{−2πikτ/L}, a(τ) = Σ_n w_n w_{n+τ} (from
     * E[X_k* Y_k] = Σ_{n,m} w_n w_m r(m − n) e^{−2πik(m−n)/L}). Cost O(L²).
     *
     * @param segmentLength L
     * @param dtSeconds Δt
     * @param crossCovariance r(τ), τ = −(L−1) … L−1
     * @return {Re E[G_k], Im E[G_k]}, k = 0 … L/2
     */
    public static double[][] expected(int segmentLength, double dtSeconds, IntToDoubleFunction crossCovariance) {
        HannWelch h = new HannWelch(segmentLength, dtSeconds, false);
        int len = segmentLength;
        double[] a = new double[len];
        for (int tau = 0; tau < len; tau++) {
            double s = 0;
            for (int n = 0; n + tau < len; n++) {
                s += h.window[n] * h.window[n + tau];
            }
            a[tau] = s;
        }
        double[] r = new double[2 * len - 1];
        for (int tau = -(len - 1); tau < len; tau++) {
            r[tau + len - 1] = crossCovariance.applyAsDouble(tau) * a[Math.abs(tau)];
        }
        double[] cos = new double[len];
        double[] sin = new double[len];
        for (int j = 0; j < len; j++) {
            cos[j] = Math.cos(2 * Math.PI * j / len);
            sin[j] = Math.sin(2 * Math.PI * j / len);
        }
        int bins = len / 2 + 1;
        double[] re = new double[bins];
        double[] im = new double[bins];
        for (int k = 0; k < bins; k++) {
            double sr = 0;
            double si = 0;
            for (int tau = -(len - 1); tau < len; tau++) {
                int j = (int) Math.floorMod((long) k * tau, (long) len);
                double v = r[tau + len - 1];
                sr += v * cos[j];
                si -= v * sin[j];
            }
            double c = ((k == 0 || k == len / 2) ? 1.0 : 2.0) * dtSeconds / h.sumSquares;
            re[k] = c * sr;
            im[k] = c * si;
        }
        return new double[][] {re, im};
    }
}
