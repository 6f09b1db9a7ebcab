package org.stillfield.analysis.spectra;

import org.stillfield.sampler.api.PhysicalConstants;

/**
 * Noise expressed as an equivalent temperature.
 *
 * <p>Convention used throughout: the symmetrised noise of a mode (or narrow band) at ω is written as
 * k_B T_eq = (ħω/2) coth(ħω/2k_BT) = ħω(n̄ + ½), so
 * <pre>
 *   T_eq = T_Q + T_P,   T_Q = ħω/(2k_B),   T_P = ħω n̄/k_B,   n̄ = 1/(e^{ħω/k_BT} − 1):
 * </pre>
 * the vacuum contributes the quantum limit T_Q (half a quantum: the minimum added noise of a
 * phase-insensitive linear amplifier referred to its input, Caves, Phys. Rev. D 26, 1817 (1982)) and
 * the Planck occupation the rest; T_eq → T for k_BT ≫ ħω. Since every variance of the sampler scales as
 * coth(ħω/2k_BT) (PHYSICS.md §2), a measured variance ratio r = σ²/σ²_vacuum gives T_eq = r T_Q.
 * Other conventions (REFERENCE-VALUES.md §7): one full quantum ħω/k_B, or ħω/(k_B ln 2).
 */
public final class NoiseTemperature {
    private NoiseTemperature() {
    }

    private static double omega(double omega) {
        if (!(omega > 0) || !Double.isFinite(omega)) {
            throw new IllegalArgumentException("omega must be positive and finite (rad/s): " + omega);
        }
        return omega;
    }

    private static double temperature(double t) {
        if (!(t >= 0) || !Double.isFinite(t)) {
            throw new IllegalArgumentException("temperature_K must be finite and >= 0: " + t);
        }
        return t;
    }

    /** @return T_Q = ħω/(2k_B), K (ω in rad/s) */
    public static double quantumLimit(double omega) {
        return PhysicalConstants.HBAR * omega(omega) / (2 * PhysicalConstants.K_B);
    }

    /** @return Planck occupation n̄ = 1/(e^{ħω/k_BT} − 1) (0 at T = 0) */
    public static double occupation(double omega, double temperatureKelvin) {
        omega(omega);
        if (temperature(temperatureKelvin) == 0) {
            return 0;
        }
        return 1.0 / Math.expm1(PhysicalConstants.HBAR * omega / (PhysicalConstants.K_B * temperatureKelvin));
    }

    /** @return thermal (Planck) part T_P = ħω n̄/k_B, K */
    public static double thermalPart(double omega, double temperatureKelvin) {
        return PhysicalConstants.HBAR * omega * occupation(omega, temperatureKelvin) / PhysicalConstants.K_B;
    }

    /** @return T_eq = T_Q + T_P = T_Q coth(ħω/2k_BT), K */
    public static double equivalent(double omega, double temperatureKelvin) {
        return quantumLimit(omega) + thermalPart(omega, temperatureKelvin);
    }

    /**
     * @param omega ω, rad/s
     * @param varianceRatio measured variance over the vacuum variance of the same mode (or band), ≥ 0
     * @return T_eq = r T_Q, K
     */
    public static double fromVarianceRatio(double omega, double varianceRatio) {
        if (!(varianceRatio >= 0) || !Double.isFinite(varianceRatio)) {
            throw new IllegalArgumentException("variance ratio must be finite and >= 0: " + varianceRatio);
        }
        return varianceRatio * quantumLimit(omega);
    }

    /**
     * Inverts coth(ħω/2k_BT) = r: T = ħω / (k_B ln((r+1)/(r−1))).
     *
     * @param omega ω, rad/s
     * @param varianceRatio r = σ²/σ²_vacuum
     * @return the physical temperature, K; 0 for r ≤ 1 (at or, by a fluctuation, below the vacuum)
     */
    public static double physicalTemperature(double omega, double varianceRatio) {
        omega(omega);
        if (!(varianceRatio >= 0) || !Double.isFinite(varianceRatio)) {
            throw new IllegalArgumentException("variance ratio must be finite and >= 0: " + varianceRatio);
        }
        if (varianceRatio <= 1) {
            return 0;
        }
        // ln((r+1)/(r−1)) = log1p(2/(r−1)): accurate both near r = 1 and for r ≫ 1.
        return PhysicalConstants.HBAR * omega / (PhysicalConstants.K_B * Math.log1p(2 / (varianceRatio - 1)));
    }
}
