package org.stillfield.analysis.spectra;

import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Shared core of the Welch estimators: periodic Hann window w_n = sin²(πn/L), segments of L
 * samples starting every L/2, forward DFT X_k = Σ w_n x_n e^{−2πikn/L} (Commons Math
 * {@link FastFourierTransformer}, radix 2), sums of |X_k|², |Y_k|² and X_k* Y_k over segments.
 *
 * <p>Normalisation (one-sided, per Hz): G_k = c_k Δt/(U K) Σ_segments X_k* Y_k with U = Σ w_n²,
 * c_k = 2 for 0 &lt; k &lt; L/2 and 1 at k = 0 and L/2. Then Σ_k G_k Δf with Δf = 1/(LΔt) equals the
 * mean of Σ w_n² x_n y_n / U over segments (Parseval), whose expectation is the covariance.
 *
 * <p>Two real segments are transformed with one complex FFT of a + ib:
 * A_k = (Z_k + Z*_{L−k})/2, B_k = (Z_k − Z*_{L−k})/(2i).
 */
final class HannWelch {
    final int length;
    final double dt;
    final boolean removeMean;
    final double[] window;
    final double sumSquares;
    /** Correlation ρ_1 = (Σ w_n w_{n+L/2})² / U² of periodograms of neighbouring segments (white noise). */
    final double overlapCorrelation;
    final double[] aa;
    final double[] bb;
    final double[] abRe;
    final double[] abIm;
    long segments;
    long seriesCount;
    /** Σ over series of K_i²/ν_i, for the equivalent degrees of freedom of unequal series. */
    double sumK2OverNu;

    HannWelch(int segmentLength, double dtSeconds, boolean removeMean) {
        if (segmentLength < 4 || Integer.bitCount(segmentLength) != 1) {
            throw new IllegalArgumentException("segment length must be a power of two >= 4 (radix-2 FFT): "
                + segmentLength);
        }
        if (!(dtSeconds > 0) || !Double.isFinite(dtSeconds)) {
            throw new IllegalArgumentException("dt_s must be positive and finite (seconds): " + dtSeconds);
        }
        length = segmentLength;
        dt = dtSeconds;
        this.removeMean = removeMean;
        window = hann(segmentLength);
        double u = 0;
        for (double w : window) {
            u += w * w;
        }
        sumSquares = u;
        double lag = 0;
        for (int n = 0; n + segmentLength / 2 < segmentLength; n++) {
            lag += window[n] * window[n + segmentLength / 2];
        }
        overlapCorrelation = (lag / u) * (lag / u);
        int bins = segmentLength / 2 + 1;
        aa = new double[bins];
        bb = new double[bins];
        abRe = new double[bins];
        abIm = new double[bins];
    }

    /** Periodic Hann window sin²(πn/L), n = 0 … L−1: its L/2-shifted copies sum to 1. */
    static double[] hann(int n) {
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            double s = Math.sin(Math.PI * i / n);
            w[i] = s * s;
        }
        return w;
    }

    /** @return number of segments a series of n samples yields */
    int segmentsIn(int n) {
        return n < length ? 0 : (n - length) / (length / 2) + 1;
    }

    /**
     * Equivalent degrees of freedom of the average of K overlapping segments for a locally flat
     * spectrum: ν = 2K / (1 + 2 Σ_{m=1}^{K−1} (1 − m/K) ρ_m), where ρ_m is the squared correlation of
     * the windows shifted by m·L/2; with 50 % overlap only ρ_1 ≠ 0, and for Hann ρ_1 = 1/36
     * (Welch, IEEE Trans. Audio Electroacoust. 15, 70 (1967); Percival &amp; Walden, Spectral Analysis for
     * Physical Applications (1993), eq. 292b; both from memory).
     */
    double dof(long k) {
        if (k <= 0) {
            return 0;
        }
        return 2.0 * k / (1 + 2.0 * (1 - 1.0 / k) * overlapCorrelation);
    }

    /** Adds all complete segments of x (auto spectrum: b = a's neighbour, both into aa). */
    void addAuto(double[] x) {
        int k = segmentsIn(x.length);
        if (k == 0) {
            throw new IllegalArgumentException("series of " + x.length + " samples is shorter than one segment of "
                + length);
        }
        double[] re = new double[length];
        double[] im = new double[length];
        for (int s = 0; s < k; s += 2) {
            load(x, s * (length / 2), re);
            if (s + 1 < k) {
                load(x, (s + 1) * (length / 2), im);
            } else {
                java.util.Arrays.fill(im, 0.0);
            }
            transform(re, im, false);
        }
        account(k);
    }

    /** Adds all complete segment pairs of x and y (equal lengths). */
    void addCross(double[] x, double[] y) {
        if (x.length != y.length) {
            throw new IllegalArgumentException("cross spectrum needs series of equal length: " + x.length + " vs "
                + y.length);
        }
        int k = segmentsIn(x.length);
        if (k == 0) {
            throw new IllegalArgumentException("series of " + x.length + " samples is shorter than one segment of "
                + length);
        }
        double[] re = new double[length];
        double[] im = new double[length];
        for (int s = 0; s < k; s++) {
            load(x, s * (length / 2), re);
            load(y, s * (length / 2), im);
            transform(re, im, true);
        }
        account(k);
    }

    private void account(int k) {
        segments += k;
        seriesCount++;
        sumK2OverNu += (double) k * k / dof(k);
    }

    private void load(double[] x, int start, double[] out) {
        double mean = 0;
        if (removeMean) {
            for (int n = 0; n < length; n++) {
                mean += x[start + n];
            }
            mean /= length;
        }
        for (int n = 0; n < length; n++) {
            out[n] = window[n] * (x[start + n] - mean);
        }
    }

    /** FFT of re + i·im and accumulation; cross = false treats both as segments of one series. */
    private void transform(double[] re, double[] im, boolean cross) {
        FastFourierTransformer.transformInPlace(new double[][] {re, im}, DftNormalization.STANDARD,
            TransformType.FORWARD);
        int half = length / 2;
        for (int k = 0; k <= half; k++) {
            int j = (length - k) % length;
            double zr = re[k];
            double zi = im[k];
            double cr = re[j];
            double ci = -im[j];
            // A = (Z + conj Z_{L−k})/2, B = (Z − conj Z_{L−k})/(2i)
            double ar = 0.5 * (zr + cr);
            double ai = 0.5 * (zi + ci);
            double br = 0.5 * (zi - ci);
            double bi = -0.5 * (zr - cr);
            double a2 = ar * ar + ai * ai;
            double b2 = br * br + bi * bi;
            if (cross) {
                aa[k] += a2;
                bb[k] += b2;
                abRe[k] += ar * br + ai * bi;
                abIm[k] += ar * bi - ai * br;
            } else {
                aa[k] += a2 + b2;
            }
        }
    }

    /** @return the one-sided scale c_k Δt/(U K) */
    double scale(int k) {
        double c = (k == 0 || k == length / 2) ? 1.0 : 2.0;
        return c * dt / (sumSquares * segments);
    }

    /** @return ν of the whole average, K²/Σ(K_i²/ν_i) (equal to Σν_i for equal series) */
    double totalDof() {
        return segments == 0 ? 0 : (double) segments * segments / sumK2OverNu;
    }

    double[] frequencies() {
        double[] f = new double[length / 2 + 1];
        for (int k = 0; k < f.length; k++) {
            f[k] = k / (length * dt);
        }
        return f;
    }

    double[] binDof() {
        double nu = totalDof();
        double[] d = new double[length / 2 + 1];
        for (int k = 0; k < d.length; k++) {
            // DC and Nyquist ordinates are real: χ²₁ per segment instead of χ²₂.
            d[k] = (k == 0 || k == length / 2) ? 0.5 * nu : nu;
        }
        return d;
    }

    void requireData() {
        if (segments == 0) {
            throw new IllegalStateException("no series added yet");
        }
    }
}
