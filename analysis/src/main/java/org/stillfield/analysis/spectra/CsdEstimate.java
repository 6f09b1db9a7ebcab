package org.stillfield.analysis.spectra;

/**
 * A one-sided cross-spectral density estimate G_xy(f_k) = 2Δt/(UK) Σ X_k* Y_k (unit_x·unit_y/Hz)
 * with the two auto spectra. With this convention G_xy is the transform of
 * R_xy(τ) = E[x(t) y(t+τ)] (so a delay of y by d gives the phase −2πf d). Immutable.
 */
public final class CsdEstimate {
    private final double[] frequency;
    private final double[] re;
    private final double[] im;
    private final double[] gxx;
    private final double[] gyy;
    private final double[] dof;
    private final long segments;
    private final double resolution;

    CsdEstimate(double[] frequency, double[] re, double[] im, double[] gxx, double[] gyy, double[] dof,
                long segments, double resolution) {
        this.frequency = frequency;
        this.re = re;
        this.im = im;
        this.gxx = gxx;
        this.gyy = gyy;
        this.dof = dof;
        this.segments = segments;
        this.resolution = resolution;
    }

    /** @return number of bins */
    public int size() {
        return re.length;
    }

    /** @return f_k, Hz */
    public double frequency(int k) {
        return frequency[k];
    }

    /** @return Re G_xy(f_k) */
    public double real(int k) {
        return re[k];
    }

    /** @return Im G_xy(f_k) */
    public double imaginary(int k) {
        return im[k];
    }

    /** @return G_xx(f_k) */
    public double psdX(int k) {
        return gxx[k];
    }

    /** @return G_yy(f_k) */
    public double psdY(int k) {
        return gyy[k];
    }

    /** @return magnitude-squared coherence |G_xy|²/(G_xx G_yy) ∈ [0, 1] */
    public double coherence(int k) {
        return (re[k] * re[k] + im[k] * im[k]) / (gxx[k] * gyy[k]);
    }

    /** @return equivalent degrees of freedom of bin k (as for the auto spectra) */
    public double dof(int k) {
        return dof[k];
    }

    /** @return segments averaged */
    public long segments() {
        return segments;
    }

    /** @return Δf, Hz */
    public double resolutionHz() {
        return resolution;
    }

    /** @return Σ_k Re G_xy Δf, the covariance E[x y] in expectation */
    public double integratedReal() {
        double s = 0;
        for (double v : re) {
            s += v;
        }
        return s * resolution;
    }
}
