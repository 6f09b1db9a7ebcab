package org.stillfield.sampler.api;

import java.util.List;
import java.util.Map;

/**
 * A cavity with perfectly conducting (PEC) walls: its geometry, filling, modes up to a cutoff and
 * their mode functions. Everything downstream of the mode list (sampling, output, analysis,
 * plots) sees a cavity only through this interface.
 *
 * <p>Conventions: PHYSICS.md §1. Mode functions are real, divergence-free, satisfy n×u = 0 and
 * n·h = 0 on the walls, and are normalised to ∫ u_l·u_l' d³r = V δ_ll'.
 */
public interface Cavity {
    /** @return short geometry name as written in specs and footers, e.g. "box" */
    String shape();

    /** @return geometry parameters in SI units, in a stable order, for footers and reports */
    Map<String, Double> parameters();

    /** @return the uniform filling */
    Medium medium();

    /** @return volume V, m³ */
    double volume();

    /** @return axis-aligned bounding box corners {min, max}, metres */
    Vec3[] bounds();

    /** @return true if the point lies inside the cavity or on its wall */
    boolean contains(Vec3 r);

    /**
     * Smooth estimate of the number of modes with wave number ≤ k (Weyl's law with whatever
     * boundary corrections are known for this shape). Used to refuse cutoffs that would
     * enumerate too many modes, and as the reference curve of the mode-count plot.
     *
     * @param k wave number, rad/m
     * @return estimated mode count
     */
    double weylCount(double k);

    /** @return wave number of the lowest mode, rad/m */
    double lowestK();

    /**
     * All modes with k ≤ kMax, sorted by k and then by label so the order is deterministic.
     *
     * @param kMax wave number cutoff, rad/m, positive and finite
     * @return the modes, each degenerate partner listed separately
     */
    List<Mode> modesUpTo(double kMax);

    /**
     * Evaluator for the mode functions of the given modes (which must come from this cavity).
     *
     * @param modes the modes, in the order the evaluator will write them
     * @return a thread-safe evaluator
     */
    ModeFunctions modeFunctions(List<Mode> modes);

    /**
     * A fast exact mode sum on the tensor-product grid xs × ys × zs, for geometries whose modes
     * separate in Cartesian coordinates; null (the default) when the cavity has none, and the
     * generic per-point evaluation is used.
     *
     * @param modes the modes, in amplitude order
     * @param xs grid x coordinates, metres
     * @param ys grid y coordinates, metres
     * @param zs grid z coordinates, metres
     * @return the fast sum, or null
     */
    default TensorGridSum tensorGridSum(List<Mode> modes, double[] xs, double[] ys, double[] zs) {
        return null;
    }
}
