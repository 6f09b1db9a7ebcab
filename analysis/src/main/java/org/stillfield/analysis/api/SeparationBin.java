package org.stillfield.analysis.api;

import java.util.Objects;
import org.stillfield.sampler.api.Field;

/**
 * One bin of a translation-averaged correlation: the mean over the bin's point pairs (r_p, r_q) of
 * the components along and across the separation d = r_q − r_p,
 *
 * <pre>
 *   C_∥ = d̂ᵀ C(r_p, r_q) d̂,   C_⊥ = (tr C(r_p, r_q) − C_∥)/2,
 * </pre>
 *
 * estimated from the ensemble, and the same average of three references. A reference that is not
 * available for the run (e.g. no plane-image formula for a curved cavity) is NaN; every other
 * number is finite.
 *
 * @param field the field
 * @param label the bin's name: its distance range, or its lattice offset for vector bins
 * @param lowM lower edge of the separation, metres
 * @param highM upper edge, metres (equal to lowM for a vector bin)
 * @param meanM mean |d| over the bin's pairs, metres
 * @param pairs number of point pairs averaged, ≥ 1
 * @param parallel estimated C_∥, (field unit)²
 * @param parallelSe its standard error from the sample-to-sample spread of the bin average, (field unit)²
 * @param perpendicular estimated C_⊥, (field unit)²
 * @param perpendicularSe its standard error, (field unit)²
 * @param modeSumParallel the mode sum's C_∥ averaged over the same pairs
 * @param modeSumPerpendicular the mode sum's C_⊥
 * @param freeParallel the free-space C_∥ at each pair's separation, averaged (same window)
 * @param freePerpendicular the free-space C_⊥
 * @param imageParallel free space plus the image in the wall nearest each pair, C_∥ (NaN when not available)
 * @param imagePerpendicular the same for C_⊥
 */
public record SeparationBin(Field field, String label, double lowM, double highM, double meanM, int pairs,
                            double parallel, double parallelSe, double perpendicular, double perpendicularSe,
                            double modeSumParallel, double modeSumPerpendicular, double freeParallel,
                            double freePerpendicular, double imageParallel, double imagePerpendicular) {
    /** Validates: estimates finite, errors ≥ 0, at least one pair. */
    public SeparationBin {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(label, "label");
        if (pairs < 1) {
            throw new IllegalArgumentException("pairs must be >= 1: " + pairs);
        }
        if (!Double.isFinite(parallel) || !Double.isFinite(perpendicular) || !(parallelSe >= 0)
            || !(perpendicularSe >= 0) || !Double.isFinite(meanM)) {
            throw new IllegalArgumentException(String.format(
                "bin %s must have finite estimates and errors >= 0: %s +- %s, %s +- %s", label, parallel, parallelSe,
                perpendicular, perpendicularSe));
        }
    }

    /** @return (estimate − mode sum)/standard error of C_∥, 0 when the error is 0 */
    public double zParallel() {
        return parallelSe > 0 ? (parallel - modeSumParallel) / parallelSe : 0.0;
    }

    /** @return (estimate − mode sum)/standard error of C_⊥, 0 when the error is 0 */
    public double zPerpendicular() {
        return perpendicularSe > 0 ? (perpendicular - modeSumPerpendicular) / perpendicularSe : 0.0;
    }
}
