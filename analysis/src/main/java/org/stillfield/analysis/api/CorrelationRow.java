package org.stillfield.analysis.api;

import java.util.Objects;
import org.stillfield.sampler.api.Field;

/**
 * One entry of the correlation table: the estimate of C^F_ij(r, r′) from the ensemble, its
 * standard error, the analytic mode sum with the same modes and window, and the z-score.
 *
 * <p>Every number is finite. A component that vanishes identically (for example a tangential E
 * component on a wall point, where every mode function is exactly zero) has zero analytic
 * variance and therefore no z-score: such a row carries {@link Status#ZERO_VARIANCE}, z = 0, and is
 * left out of the verdict.
 *
 * @param field the field F
 * @param first global index of r
 * @param second global index of r′
 * @param i component at r (0..2)
 * @param j component at r′ (0..2)
 * @param estimate (1/N) Σ F_i(r) F_j(r′), unit (field unit)²
 * @param standardError √((C_ii(r,r) C_jj(r′,r′) + C_ij²)/N) from the analytic values (Isserlis), (field unit)²
 * @param analytic Σ_l W_l σ_l² u_l,i(r) u_l,j(r′) (h_l for B), (field unit)²
 * @param z (estimate − analytic)/standardError when tested, 0 otherwise
 * @param status whether the row entered the verdict
 */
public record CorrelationRow(Field field, int first, int second, int i, int j, double estimate,
                             double standardError, double analytic, double z, Status status) {
    /** Whether a row is part of the verdict. */
    public enum Status {
        /** Positive standard error: the z-score is meaningful and counted in the verdict. */
        TESTED,
        /** C_ii(r,r)·C_jj(r′,r′) = 0 exactly: the component vanishes identically, no z-score. */
        ZERO_VARIANCE
    }

    /** Validates: components in 0..2, all numbers finite. */
    public CorrelationRow {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(status, "status");
        if (i < 0 || i > 2 || j < 0 || j > 2) {
            throw new IllegalArgumentException("components i, j must lie in 0..2: " + i + ", " + j);
        }
        if (!Double.isFinite(estimate) || !Double.isFinite(standardError) || !Double.isFinite(analytic)
            || !Double.isFinite(z)) {
            throw new IllegalArgumentException(String.format(
                "row %s (%d,%d)[%d,%d] must have finite numbers: estimate %s, standard error %s, analytic %s, z %s",
                field, first, second, i, j, estimate, standardError, analytic, z));
        }
    }

    /** A tested row (the form of the table before rows could be flagged). */
    public CorrelationRow(Field field, int first, int second, int i, int j, double estimate,
                          double standardError, double analytic, double z) {
        this(field, first, second, i, j, estimate, standardError, analytic, z, Status.TESTED);
    }

    /** @return true when the row entered the verdict */
    public boolean tested() {
        return status == Status.TESTED;
    }
}
