package org.stillfield.analysis.spectra;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * A one-sided power spectral density estimate on the bins f_k = k Δf, k = 0 … L/2, in
 * (signal unit)²/Hz, normalised so that Σ_k G_k Δf is the mean windowed power (Parseval) whose
 * expectation is the variance. Immutable; arrays are copied out.
 */
public final class PsdEstimate {
    private final double[] frequency;
    private final double[] psd;
    private final double[] dof;
    private final long segments;
    private final long series;
    private final double resolution;

    PsdEstimate(double[] frequency, double[] psd, double[] dof, long segments, long series, double resolution) {
        this.frequency = frequency;
        this.psd = psd;
        this.dof = dof;
        this.segments = segments;
        this.series = series;
        this.resolution = resolution;
    }

    /** @return number of bins L/2 + 1 */
    public int size() {
        return psd.length;
    }

    /** @return f_k, Hz */
    public double frequency(int k) {
        return frequency[k];
    }

    /** @return G_k, unit²/Hz */
    public double value(int k) {
        return psd[k];
    }

    /** @return equivalent degrees of freedom of bin k (half at DC and Nyquist) */
    public double dof(int k) {
        return dof[k];
    }

    /** @return bin spacing Δf = 1/(L Δt), Hz */
    public double resolutionHz() {
        return resolution;
    }

    /** @return equivalent noise bandwidth of the Hann window, 1.5 Δf, Hz */
    public double noiseBandwidthHz() {
        return 1.5 * resolution;
    }

    /** @return segments averaged */
    public long segments() {
        return segments;
    }

    /** @return series (ensemble samples) averaged */
    public long series() {
        return series;
    }

    /** @return copy of the frequencies, Hz */
    public double[] frequencies() {
        return frequency.clone();
    }

    /** @return copy of the PSD values */
    public double[] values() {
        return psd.clone();
    }

    /** @return Σ_k G_k Δf, unit² (the variance in expectation) */
    public double integratedPower() {
        double s = 0;
        for (double v : psd) {
            s += v;
        }
        return s * resolution;
    }

    /**
     * @param fLowHz lower edge, Hz
     * @param fHighHz upper edge, Hz
     * @return Σ G_k Δf over the bins with f_k in [fLow, fHigh], unit²
     */
    public double bandPower(double fLowHz, double fHighHz) {
        double s = 0;
        for (int k = 0; k < psd.length; k++) {
            if (frequency[k] >= fLowHz && frequency[k] <= fHighHz) {
                s += psd[k];
            }
        }
        return s * resolution;
    }

    /**
     * χ² confidence interval of bin k: ν Ĝ/χ²_ν(1 − α/2) ≤ G ≤ ν Ĝ/χ²_ν(α/2) with α = 1 − level,
     * valid where the spectrum is locally flat over the window's bandwidth (Welch 1967; Percival &amp;
     * Walden 1993, source from memory).
     *
     * @param k bin
     * @param level confidence level in (0, 1), e.g. 0.95
     * @return {lower, upper}
     */
    public double[] confidence(int k, double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("confidence level must lie in (0, 1): " + level);
        }
        ChiSquaredDistribution chi2 = new ChiSquaredDistribution(dof[k]);
        double a = 1 - level;
        return new double[] {dof[k] * psd[k] / chi2.inverseCumulativeProbability(1 - a / 2),
            dof[k] * psd[k] / chi2.inverseCumulativeProbability(a / 2)};
    }
}
