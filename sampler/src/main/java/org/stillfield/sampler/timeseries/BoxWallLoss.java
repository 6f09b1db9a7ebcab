package org.stillfield.sampler.timeseries;

import java.util.List;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * Conductor Q of box modes by direct integration of the wall losses (perturbation method:
 * Pozar, Microwave Engineering, cavity resonators; Jackson, Classical Electrodynamics §8.8, source
 * from memory).
 *
 * <p>For a mode with E = ω q₀ u sin ωt and B = k q₀ h cos ωt (PHYSICS.md §2, e = −q̇), the stored
 * energy is W = (ε/2) ω² q₀² ∫u·u = (ε/2) ω² q₀² V and the time-averaged wall loss of a good
 * conductor of surface resistance R_s = √(ωμ0/2σ) is P = (R_s/2) ∮ |H_tan|² dS with H = B/μ.
 * With ω = k/√(εμ) this gives
 * <pre>
 *   Q_c = ω W / P = μ ω V / (R_s ∮ |h_tan|² dS),
 * </pre>
 * μ the filling's permeability (the wall is taken non-magnetic, μ_c = μ0, as in Pozar). The
 * integral uses the cavity's own {@link ModeFunctions} on the six faces, by product Gauss–Legendre
 * quadrature with enough nodes per axis for the highest mode of a chunk to integrate the
 * trigonometric integrands to rounding.
 */
final class BoxWallLoss {
    /** Modes evaluated together; sorted by k, so each chunk sizes its rule to its own highest mode. */
    private static final int CHUNK = 64;

    private BoxWallLoss() {
    }

    /**
     * @param box the cavity
     * @param modes its modes
     * @param omega ω of each mode, rad/s
     * @param sigma wall conductivity, S/m
     * @return Q_c of each mode
     */
    static double[] conductorQ(RectangularCavity box, List<Mode> modes, double[] omega, double sigma) {
        double[] s = tangentialIntegrals(box, modes);
        Medium medium = box.medium();
        double[] q = new double[modes.size()];
        for (int l = 0; l < q.length; l++) {
            double rs = surfaceResistance(omega[l], sigma);
            q[l] = medium.permeability() * omega[l] * box.volume() / (rs * s[l]);
        }
        return q;
    }

    /**
     * @param omega angular frequency, rad/s
     * @param sigma conductivity, S/m
     * @return R_s = √(ωμ0/2σ), Ω
     */
    static double surfaceResistance(double omega, double sigma) {
        return Math.sqrt(omega * PhysicalConstants.MU_0 / (2 * sigma));
    }

    /**
     * @param box the cavity
     * @param modes its modes
     * @return ∮ |h_tan|² dS over the six faces for each mode, m²
     */
    static double[] tangentialIntegrals(RectangularCavity box, List<Mode> modes) {
        Vec3[] bounds = box.bounds();
        double[] lo = {bounds[0].x(), bounds[0].y(), bounds[0].z()};
        double[] hi = {bounds[1].x(), bounds[1].y(), bounds[1].z()};
        GaussIntegratorFactory factory = new GaussIntegratorFactory();
        double[] out = new double[modes.size()];
        for (int start = 0; start < modes.size(); start += CHUNK) {
            List<Mode> chunk = modes.subList(start, Math.min(modes.size(), start + CHUNK));
            double kMax = 0;
            for (Mode m : chunk) {
                kMax = Math.max(kMax, m.k());
            }
            ModeFunctions f = box.modeFunctions(chunk);
            double[] acc = new double[chunk.size()];
            for (int axis = 0; axis < 3; axis++) {
                int a1 = (axis + 1) % 3;
                int a2 = (axis + 2) % 3;
                double[][] n1 = nodes(factory, lo[a1], hi[a1], kMax);
                double[][] n2 = nodes(factory, lo[a2], hi[a2], kMax);
                for (double wall : new double[] {lo[axis], hi[axis]}) {
                    face(f, axis, a1, a2, wall, n1, n2, acc);
                }
            }
            System.arraycopy(acc, 0, out, start, acc.length);
        }
        return out;
    }

    /** Adds ∫ (h_a1² + h_a2²) over one face (the tangential components) to acc. */
    private static void face(ModeFunctions f, int axis, int a1, int a2, double wall, double[][] n1, double[][] n2,
                             double[] acc) {
        int m = f.modeCount();
        double[] h = new double[3 * m];
        double[] r = new double[3];
        r[axis] = wall;
        for (int i = 0; i < n1[0].length; i++) {
            r[a1] = n1[0][i];
            for (int j = 0; j < n2[0].length; j++) {
                r[a2] = n2[0][j];
                f.evaluate(r[0], r[1], r[2], null, h);
                double w = n1[1][i] * n2[1][j];
                for (int l = 0; l < m; l++) {
                    double t1 = h[3 * l + a1];
                    double t2 = h[3 * l + a2];
                    acc[l] += w * (t1 * t1 + t2 * t2);
                }
            }
        }
    }

    /**
     * Gauss–Legendre nodes and weights on [lo, hi] for integrands up to cos(2k x): the rule maps the
     * interval to [−1, 1], where the integrand oscillates as cos(α t) with α = k (hi − lo), and
     * n = α/2 + 2√α + 12 nodes bring the error of such an integral below 1e-14 (checked for α up to
     * 400 against the exact 2 sin α/α).
     */
    private static double[][] nodes(GaussIntegratorFactory factory, double lo, double hi, double k) {
        double alpha = k * (hi - lo);
        int n = (int) Math.ceil(alpha / 2 + 2 * Math.sqrt(alpha) + 12);
        GaussIntegrator rule = factory.legendre(n, lo, hi);
        double[] x = new double[n];
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = rule.getPoint(i);
            w[i] = rule.getWeight(i);
        }
        return new double[][] {x, w};
    }
}
