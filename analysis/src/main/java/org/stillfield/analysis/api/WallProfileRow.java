package org.stillfield.analysis.api;

import java.util.Objects;
import org.stillfield.sampler.api.Field;

/**
 * One point of a mean-square profile against the distance from the nearest wall: the ensemble's
 * ⟨F_c²⟩ (one component) or ⟨F²⟩ = Σ_c ⟨F_c²⟩, the analytic mode sum, and the single-plane image
 * reference (free space plus the image in the nearest wall, PHYSICS.md §4), which holds near that
 * wall and ignores the others.
 *
 * @param field the field
 * @param point global index of the point
 * @param distanceM distance from the nearest wall, metres
 * @param wallAxis normal axis of that wall, 0..2
 * @param wallPositionM coordinate of that wall, metres
 * @param component 0, 1, 2 for F_x², F_y², F_z²; 3 for the sum F²
 * @param estimate (1/N) Σ_s F_c(r)², (field unit)²
 * @param standardError Isserlis: √(2C_cc²/N) for a component, √(2Σ_ij C_ij²/N) for the sum, from the
 *     mode sum; 0 when the component vanishes identically
 * @param modeSum the mode sum with the run's modes and window, (field unit)²
 * @param planeImage free space plus the one-wall image with the same window, (field unit)²
 * @param freeSpace free space alone with the same window, (field unit)²
 * @param z (estimate − modeSum)/standardError, 0 when not tested
 */
public record WallProfileRow(Field field, int point, double distanceM, int wallAxis, double wallPositionM,
                             int component, double estimate, double standardError, double modeSum,
                             double planeImage, double freeSpace, double z) {
    /** Validates. */
    public WallProfileRow {
        Objects.requireNonNull(field, "field");
        if (component < 0 || component > 3) {
            throw new IllegalArgumentException("component must lie in 0..3 (3 = sum): " + component);
        }
        if (wallAxis < 0 || wallAxis > 2) {
            throw new IllegalArgumentException("wallAxis must lie in 0..2: " + wallAxis);
        }
        if (!Double.isFinite(estimate) || !(standardError >= 0) || !Double.isFinite(modeSum) || !Double.isFinite(z)
            || !(distanceM >= 0)) {
            throw new IllegalArgumentException(String.format(
                "profile row %s point %d component %d must be finite: estimate %s, se %s, mode sum %s, z %s, distance %s",
                field, point, component, estimate, standardError, modeSum, z, distanceM));
        }
    }

    /** @return "x", "y", "z" or "sum" */
    public String componentName() {
        return component == 3 ? "sum" : String.valueOf("xyz".charAt(component));
    }

    /** @return true when the row has a z-score (the component does not vanish identically) */
    public boolean tested() {
        return standardError > 0;
    }
}
