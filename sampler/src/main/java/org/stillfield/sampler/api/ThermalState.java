package org.stillfield.sampler.api;

/**
 * The field's state: the vacuum (T = 0) or a thermal state at temperature T. Every mode's
 * variance is multiplied by coth(ħω/2k_BT) = 1 + 2n̄(ω) (PHYSICS.md §2).
 *
 * @param temperatureKelvin temperature, K, finite and ≥ 0 (0 is the vacuum)
 */
public record ThermalState(double temperatureKelvin) {
    /** The vacuum. */
    public static final ThermalState VACUUM = new ThermalState(0.0);

    /** Validates the temperature. */
    public ThermalState {
        if (!(temperatureKelvin >= 0) || !Double.isFinite(temperatureKelvin)) {
            throw new IllegalArgumentException("state.temperature_K must be finite and >= 0: " + temperatureKelvin);
        }
    }

    /** @return true for T = 0 */
    public boolean isVacuum() {
        return temperatureKelvin == 0.0;
    }

    /**
     * @param omega angular frequency, rad/s
     * @return coth(ħω/2k_BT), 1 for the vacuum
     */
    public double varianceFactor(double omega) {
        if (isVacuum()) {
            return 1.0;
        }
        double x = PhysicalConstants.HBAR * omega / (2.0 * PhysicalConstants.K_B * temperatureKelvin);
        // Above x ≈ 20 coth x − 1 = 2e^{−2x}/(1 − e^{−2x}) is below 1e-17: avoid tanh's rounding.
        if (x > 20) {
            return 1.0 + 2.0 * Math.exp(-2.0 * x);
        }
        return 1.0 / Math.tanh(x);
    }

    /**
     * @param omega angular frequency, rad/s
     * @return Planck occupation n̄ = 1/(e^{ħω/k_BT} − 1), 0 for the vacuum
     */
    public double occupation(double omega) {
        if (isVacuum()) {
            return 0.0;
        }
        double y = PhysicalConstants.HBAR * omega / (PhysicalConstants.K_B * temperatureKelvin);
        return 1.0 / Math.expm1(y);
    }
}
