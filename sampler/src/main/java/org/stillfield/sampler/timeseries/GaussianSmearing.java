package org.stillfield.sampler.timeseries;

import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * Gaussian average ⟨u_l⟩_w(r₀) = ∫ u_l(r) (2πw²)^{−3/2} e^{−|r−r₀|²/2w²} d³r of the mode functions.
 *
 * <p>Box hook: a box mode function is a product of sin/cos of k_x x, k_y y, k_z z, and the normal
 * average of each factor is exact, ⟨sin kx⟩ = e^{−k²w²/2} sin kx₀ (likewise cos; the characteristic
 * function of the normal distribution). So ⟨u_l⟩ = e^{−k_l²w²/2} u_l(r₀) with k_l² = k_x² + k_y² + k_z²,
 * the average of the formula's continuation beyond the walls (its image extension) where the
 * Gaussian reaches them.
 *
 * <p>Other shapes: product Gauss–Hermite quadrature with {@value #HERMITE_NODES} nodes per axis. Its
 * outermost nodes sit ±{@code 5.5 w} from r₀ and must lie inside the cavity, since a mode function is
 * defined only there.
 */
final class GaussianSmearing {
    /** Gauss–Hermite nodes per axis: exact for polynomial degree 23, error ≪ 1e-9 while k w ≲ 3. */
    static final int HERMITE_NODES = 12;

    private GaussianSmearing() {
    }

    /**
     * @param table the modes
     * @param r0 centre, metres
     * @param w width (standard deviation per axis), m
     * @param name probe name for messages
     * @return ⟨u⟩, length 3M, [3l + i]
     */
    static double[] smearedU(ModeTable table, Vec3 r0, double w, String name) {
        if (table.cavity() instanceof RectangularCavity) {
            return analyticBox(table, r0, w);
        }
        return quadrature(table, r0, w, name);
    }

    /** Box: e^{−k²w²/2} u(r₀). */
    static double[] analyticBox(ModeTable table, Vec3 r0, double w) {
        int m = table.size();
        double[] u = new double[3 * m];
        table.cavity().modeFunctions(table.modes()).evaluate(r0.x(), r0.y(), r0.z(), u, null);
        for (int l = 0; l < m; l++) {
            double k = table.modes().get(l).k();
            double f = Math.exp(-0.5 * k * k * w * w);
            u[3 * l] *= f;
            u[3 * l + 1] *= f;
            u[3 * l + 2] *= f;
        }
        return u;
    }

    /** Product Gauss–Hermite: ∫ e^{−t²} g(t) dt ≈ Σ w_i g(t_i) with r = r₀ + √2 w t. */
    static double[] quadrature(ModeTable table, Vec3 r0, double w, String name) {
        Cavity cavity = table.cavity();
        GaussIntegrator gh = new GaussIntegratorFactory().hermite(HERMITE_NODES);
        int n = gh.getNumberOfPoints();
        double[] x = new double[n];
        double[] wt = new double[n];
        double norm = 1.0 / Math.sqrt(Math.PI);
        for (int i = 0; i < n; i++) {
            x[i] = Math.sqrt(2.0) * w * gh.getPoint(i);
            wt[i] = gh.getWeight(i) * norm;
        }
        int m = table.size();
        ModeFunctions f = cavity.modeFunctions(table.modes());
        double[] u = new double[3 * m];
        double[] acc = new double[3 * m];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                for (int k = 0; k < n; k++) {
                    Vec3 r = new Vec3(r0.x() + x[i], r0.y() + x[j], r0.z() + x[k]);
                    if (!cavity.contains(r)) {
                        throw new IllegalArgumentException(String.format(
                            "probe %s width_m = %g is too large: the Gaussian stencil reaches %s m, outside the"
                                + " cavity; keep the probe at least %.3g m from every wall or reduce width_m",
                            name, w, r, Math.abs(x[0])));
                    }
                    f.evaluate(r.x(), r.y(), r.z(), u, null);
                    double weight = wt[i] * wt[j] * wt[k];
                    for (int c = 0; c < 3 * m; c++) {
                        acc[c] += weight * u[c];
                    }
                }
            }
        }
        return acc;
    }
}
