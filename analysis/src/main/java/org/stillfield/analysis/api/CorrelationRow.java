package org.stillfield.analysis.api;

import org.stillfield.sampler.api.Field;

/**
 * One entry of the correlation table: the estimate of C^F_ij(r, r′) from the ensemble, its
 * standard error, the analytic mode sum with the same modes and window, and the z-score.
 *
 * @param field the field F
 * @param first global index of r
 * @param second global index of r′
 * @param i component at r (0..2)
 * @param j component at r′ (0..2)
 * @param estimate (1/N) Σ F_i(r) F_j(r′), unit (field unit)²
 * @param standardError √((C_ii(r,r) C_jj(r′,r′) + C_ij²)/N) from the analytic values (Isserlis)
 * @param analytic Σ_l W_l σ_l² u_l,i(r) u_l,j(r′)
 * @param z (estimate − analytic)/standardError
 */
public record CorrelationRow(Field field, int first, int second, int i, int j, double estimate,
                             double standardError, double analytic, double z) {
}
