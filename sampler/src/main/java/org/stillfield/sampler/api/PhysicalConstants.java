package org.stillfield.sampler.api;

/**
 * Physical constants, CODATA 2018 (Tiesinga, Mohr, Newell, Taylor, "The 2018 CODATA Recommended
 * Values of the Fundamental Physical Constants", NIST, 2019). SI units.
 *
 * <p>c, h and k_B are exact since the 2019 SI redefinition; ε0 and μ0 are the measured 2018 values.
 * Newer adjustments (CODATA 2022) differ in ε0 and μ0 at about 7e-10; every dataset records which
 * set it was made with.
 */
public final class PhysicalConstants {
    /** Name of this constant set, written into every dataset footer. */
    public static final String SET = "CODATA 2018";
    /** Speed of light in vacuum, m/s (exact). */
    public static final double C = 299_792_458.0;
    /** Planck constant, J·s (exact). */
    public static final double H = 6.62607015e-34;
    /** Reduced Planck constant h/2π, J·s. */
    public static final double HBAR = H / (2.0 * Math.PI);
    /** Boltzmann constant, J/K (exact). */
    public static final double K_B = 1.380649e-23;
    /** Vacuum permittivity, F/m (CODATA 2018). */
    public static final double EPSILON_0 = 8.8541878128e-12;
    /** Vacuum permeability, N/A² (CODATA 2018). */
    public static final double MU_0 = 1.25663706212e-6;

    private PhysicalConstants() {
    }
}
