package org.stillfield.sampler.api;

/**
 * Uniform, lossless, isotropic filling of the cavity (PHYSICS.md §1): the wave speed is
 * c/√(ε_r μ_r) and ε0 becomes ε0 ε_r in every variance.
 *
 * @param epsilonR relative permittivity, ≥ 1 and finite
 * @param muR relative permeability, &gt; 0 and finite
 */
public record Medium(double epsilonR, double muR) {
    /** Empty cavity. */
    public static final Medium VACUUM = new Medium(1.0, 1.0);

    /** Validates the relative constants. */
    public Medium {
        if (!(epsilonR >= 1.0) || !Double.isFinite(epsilonR)) {
            throw new IllegalArgumentException("eps_r must be finite and at least 1: " + epsilonR);
        }
        if (!(muR > 0.0) || !Double.isFinite(muR)) {
            throw new IllegalArgumentException("mu_r must be positive and finite: " + muR);
        }
    }

    /** @return phase velocity in the filling, m/s */
    public double waveSpeed() {
        return PhysicalConstants.C / Math.sqrt(epsilonR * muR);
    }

    /** @return ε0 ε_r, F/m */
    public double permittivity() {
        return PhysicalConstants.EPSILON_0 * epsilonR;
    }

    /** @return μ0 μ_r, N/A² */
    public double permeability() {
        return PhysicalConstants.MU_0 * muR;
    }
}
