package org.stillfield.analysis.api;

import java.util.Objects;
import org.stillfield.sampler.api.Field;

/**
 * The kernel K = Σ_l ρ_l f_l f_lᵀ/(V²σ_l²) (PHYSICS.md §4, with a regulator ρ) at one separation r,
 * averaged over the pairs (r₀, r₀ + r n̂) of several origins r₀ and directions n̂: the components
 * along (∥ = n̂ᵀKn̂) and across (⊥ = (tr K − K_∥)/2) the separation. Unit 1/((field unit)²·m⁶).
 *
 * @param field the field
 * @param separationM r, metres
 * @param parallel K_∥ from the sampled per-mode variances (bias-corrected, see ModeSpaceKernel)
 * @param parallelSe its standard error (exact for Gaussian amplitudes)
 * @param perpendicular K_⊥ from the samples
 * @param perpendicularSe its standard error
 * @param modeSumParallel K_∥ of the mode sum with the drawn variances σ_l² (no sampling)
 * @param modeSumPerpendicular K_⊥ of the mode sum
 * @param freeParallel free-space K_∥ with the same regulator and band (quadrature)
 * @param freePerpendicular free-space K_⊥ with the same regulator and band
 * @param idealParallel the unregulated free-space kernel's K_∥: (2ε/ħc)/(π²r²) for E, (2εc/ħ)·2/(π²r⁴) for A
 * @param idealPerpendicular its K_⊥: 0 for E and B, −(2εc/ħ)·2/(π²r⁴) for A (REFERENCE-VALUES.md pitfall 3)
 */
public record KernelPoint(Field field, double separationM, double parallel, double parallelSe, double perpendicular,
                          double perpendicularSe, double modeSumParallel, double modeSumPerpendicular,
                          double freeParallel, double freePerpendicular, double idealParallel,
                          double idealPerpendicular) {
    /** Validates. */
    public KernelPoint {
        Objects.requireNonNull(field, "field");
        if (!(separationM > 0) || !Double.isFinite(parallel) || !Double.isFinite(perpendicular) || !(parallelSe >= 0)
            || !(perpendicularSe >= 0) || !Double.isFinite(modeSumParallel)) {
            throw new IllegalArgumentException(String.format(
                "kernel point %s r = %s must be finite with errors >= 0: %s +- %s, %s +- %s", field, separationM,
                parallel, parallelSe, perpendicular, perpendicularSe));
        }
    }

    /** @return (K̂_∥ − mode sum)/standard error, 0 when the error is 0 */
    public double zParallel() {
        return parallelSe > 0 ? (parallel - modeSumParallel) / parallelSe : 0.0;
    }

    /** @return (K̂_⊥ − mode sum)/standard error, 0 when the error is 0 */
    public double zPerpendicular() {
        return perpendicularSe > 0 ? (perpendicular - modeSumPerpendicular) / perpendicularSe : 0.0;
    }
}
