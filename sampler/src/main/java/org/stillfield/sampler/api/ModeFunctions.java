package org.stillfield.sampler.api;

/**
 * Evaluates the electric and magnetic mode functions u_l and h_l = (1/k_l)∇×u_l of a fixed list
 * of modes at points (PHYSICS.md §1). Both are dimensionless and normalised to ∫ u·u = V.
 *
 * <p>Implementations may precompute per-mode constants; they are immutable and safe to share
 * between threads.
 */
public interface ModeFunctions {
    /** @return number of modes M this evaluator covers */
    int modeCount();

    /**
     * Writes u_l(r) and h_l(r) for every mode at one point.
     *
     * @param x x coordinate, metres
     * @param y y coordinate, metres
     * @param z z coordinate, metres
     * @param u output, length ≥ 3M, u[3l + i] = component i of u_l; null to skip
     * @param h output, length ≥ 3M, h[3l + i] = component i of h_l; null to skip
     */
    void evaluate(double x, double y, double z, double[] u, double[] h);
}
