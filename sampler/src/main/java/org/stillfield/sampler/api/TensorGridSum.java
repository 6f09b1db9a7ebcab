package org.stillfield.sampler.api;

/**
 * Optional fast path for cavities whose mode functions factor into one-dimensional functions of x,
 * y and z: the mode sum Σ_l a_l f_l(r) on a tensor-product grid, evaluated as three successive
 * one-axis contractions instead of P·M products. Exact: it equals the direct sum to rounding.
 *
 * <p>Implementations are thread-safe: {@link #sum} may be called concurrently (scratch is per call
 * or per thread).
 */
public interface TensorGridSum {
    /**
     * Writes Σ_l a_l u_l (or Σ_l a_l k_l h_l when {@code curl} is true) at every grid point.
     *
     * @param amplitudes a_l in the mode order the sum was built for
     * @param curl false for u (A from q, E from e), true for k·h (B from q)
     * @param out output, out[offset + 3p + i] = component i at grid point p (x index fastest)
     * @param offset where the grid's first point starts in out
     * @return true if every value written is proven finite (from a bound on the inputs), false if
     *     the caller must check the values itself
     */
    boolean sum(double[] amplitudes, boolean curl, double[] out, int offset);
}
