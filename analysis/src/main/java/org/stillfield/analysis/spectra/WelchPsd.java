package org.stillfield.analysis.spectra;

import java.util.Objects;
import java.util.function.IntToDoubleFunction;

/**
 * Welch's averaged periodogram (Welch, IEEE Trans. Audio Electroacoust. 15, 70 (1967), source from
 * memory): periodic Hann window, segments of L samples overlapping by L/2, averaged over every
 * segment of every series (ensemble sample) added. One-sided, unit²/Hz, integrating to the
 * variance (see {@link HannWelch} for the normalisation). Not thread-safe.
 */
public final class WelchPsd {
    private final HannWelch core;

    private WelchPsd(HannWelch core) {
        this.core = core;
    }

    /**
     * @param segmentLength L, a power of two ≥ 4
     * @param dtSeconds sampling step, s
     * @param detrend what to remove from each segment
     * @return an empty estimator
     */
    public static WelchPsd of(int segmentLength, double dtSeconds, Detrend detrend) {
        Objects.requireNonNull(detrend, "detrend");
        return new WelchPsd(new HannWelch(segmentLength, dtSeconds, detrend == Detrend.MEAN));
    }

    /**
     * Adds every complete segment of one series; a trailing part shorter than L/2 is unused.
     *
     * @param series samples at spacing dt, length ≥ L
     */
    public void add(double[] series) {
        core.addAuto(series);
    }

    /** @return segments averaged so far */
    public long segments() {
        return core.segments;
    }

    /** @return the estimate over everything added */
    public PsdEstimate estimate() {
        core.requireData();
        double[] g = new double[core.aa.length];
        for (int k = 0; k < g.length; k++) {
            g[k] = core.scale(k) * core.aa[k];
        }
        return new PsdEstimate(core.frequencies(), g, core.binDof(), core.segments, core.seriesCount,
            1.0 / (core.length * core.dt));
    }

    /**
     * Equivalent degrees of freedom of K overlapping Hann segments, 2K/(1 + (1 − 1/K)/18) (see
     * {@link HannWelch#dof}).
     *
     * @param segmentLength L
     * @param segments K ≥ 1
     * @return ν
     */
    public static double equivalentDof(int segmentLength, long segments) {
        return new HannWelch(segmentLength, 1.0, false).dof(segments);
    }

    /**
     * Expectation of this estimator for a stationary process, from its autocovariance at integer
     * lags, r(τ) = E[x_n x_{n+τ}]: E[G_k] = c_k Δt/U Σ_{|τ|&lt;L} a(τ) r(τ) e^{−2πikτ/L} with the window
     * autocorrelation a(τ) = Σ_n w_n w_{n+τ}. It differs from the true spectrum by the window's
     * smoothing (resolution) only, so estimates can be compared with it bin by bin.
     *
     * @param segmentLength L
     * @param dtSeconds Δt
     * @param autocovariance r(τ) for τ = −(L−1) … L−1
     * @return E[G_k], k = 0 … L/2
     */
    public static double[] expected(int segmentLength, double dtSeconds, IntToDoubleFunction autocovariance) {
        return WelchCsd.expected(segmentLength, dtSeconds, autocovariance)[0];
    }
}
