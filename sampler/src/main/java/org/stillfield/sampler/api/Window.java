package org.stillfield.sampler.api;

import org.apache.commons.math3.special.Gamma;

/**
 * Spectral window W(ω) ∈ [0,1] that multiplies each mode's variance (PHYSICS.md §3).
 *
 * <p>A hard window keeps modes with ω ≤ ω_c at full weight and enumerates nothing above. A smooth
 * window (exponential e^{−ω/ω_c}, Gaussian e^{−(ω/ω_c)²}) is truncated at the frequency where its
 * weight falls to {@code tolerance}; {@link #neglectedFraction(int)} says how much of ⟨F²⟩ that
 * drops.
 *
 * @param kind window shape
 * @param omegaC cutoff angular frequency ω_c, rad/s
 * @param tolerance smallest weight kept by a smooth window, in (0, 0.5); ignored by a hard window
 */
public record Window(Kind kind, double omegaC, double tolerance) {
    /** Window shapes. */
    public enum Kind {
        /** W = 1 for ω ≤ ω_c, no modes above. */
        HARD,
        /** W = exp(−ω/ω_c). */
        EXP,
        /** W = exp(−(ω/ω_c)²). */
        GAUSS
    }

    /** Default truncation weight of smooth windows. */
    public static final double DEFAULT_TOLERANCE = 1e-9;

    /** Validates the parameters. */
    public Window {
        if (kind == null) {
            throw new IllegalArgumentException("window kind must be one of hard, exp, gauss");
        }
        if (!(omegaC > 0) || !Double.isFinite(omegaC)) {
            throw new IllegalArgumentException("window cutoff must be positive and finite: " + omegaC);
        }
        if (!(tolerance > 0 && tolerance < 0.5)) {
            throw new IllegalArgumentException("window tolerance must lie in (0, 0.5): " + tolerance);
        }
    }

    /** @return W(ω), zero above the truncation frequency */
    public double weight(double omega) {
        if (omega > truncationOmega()) {
            return 0.0;
        }
        switch (kind) {
            case HARD: return 1.0;
            case EXP: return Math.exp(-omega / omegaC);
            default: {
                double x = omega / omegaC;
                return Math.exp(-x * x);
            }
        }
    }

    /** @return highest angular frequency enumerated, rad/s */
    public double truncationOmega() {
        switch (kind) {
            case HARD: return omegaC;
            case EXP: return omegaC * Math.log(1.0 / tolerance);
            default: return omegaC * Math.sqrt(Math.log(1.0 / tolerance));
        }
    }

    /**
     * Fraction of ∫₀^∞ ω^p W(ω) dω that lies above the truncation frequency. With Weyl's density
     * of modes dN ∝ ω² dω, ⟨E²⟩ and ⟨B²⟩ weigh modes as ω^3 (p = 3) and ⟨A²⟩ as ω (p = 1), so
     * this is the smooth-density estimate of the part of ⟨F²⟩ the truncation drops.
     *
     * @param p power of ω, ≥ 0
     * @return neglected fraction in [0,1]; 0 for a hard window
     */
    public double neglectedFraction(int p) {
        if (p < 0) {
            throw new IllegalArgumentException("power p must be >= 0: " + p);
        }
        double x = truncationOmega() / omegaC;
        switch (kind) {
            case HARD: return 0.0;
            // ∫_x^∞ t^p e^{-t} dt / Γ(p+1) = Q(p+1, x)
            case EXP: return Gamma.regularizedGammaQ(p + 1.0, x);
            // t = s², ∫ s^p e^{-s²} ds ∝ ∫ t^{(p-1)/2} e^{-t} dt → Q((p+1)/2, x²)
            default: return Gamma.regularizedGammaQ((p + 1.0) / 2.0, x * x);
        }
    }

    /** @return neglected fraction of ⟨F²⟩ for a field (see {@link #neglectedFraction(int)}) */
    public double neglectedFraction(Field field) {
        return neglectedFraction(field == Field.A ? 1 : 3);
    }
}
