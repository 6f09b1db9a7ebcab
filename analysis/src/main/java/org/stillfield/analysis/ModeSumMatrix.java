package org.stillfield.analysis;

import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;

/**
 * A weighted mode sum over all pairs of a set of coordinates at once, as one matrix product:
 * G_ab = Σ_l w_l f_l,c(a)(r_p(a)) f_l,c(b)(r_p(b)), with coordinate a = (point p, component c),
 * f = u for A and E and h for B (PHYSICS.md §4). With w_l = {@link ModeTable#variance(Field, int)}
 * this is the analytic covariance of the coordinates; with w_l = ρ_l/(V²σ_l²) it is the mode-space
 * kernel K (see {@link ModeSpaceKernel}).
 *
 * <p>Evaluation: the modes are processed in blocks of {@value #BLOCK}; each block's scaled
 * basis B (p × block, B_al = √|w_l| f_l(a), signs kept separately) adds B Bᵀ to the result through
 * EJML's symmetric outer product. Memory is p² + p·block doubles; time p²·M.
 */
public final class ModeSumMatrix {
    /** Modes per block. */
    static final int BLOCK = 1024;

    private ModeSumMatrix() {
    }

    /**
     * The analytic covariance of the coordinates: w_l = the drawn variance of mode l.
     *
     * @param table modes and variances
     * @param field the field
     * @param points the points, metres
     * @param components components per point (each 0..2, distinct); coordinate a = p·c + k
     * @return the p·c × p·c symmetric matrix, (field unit)²
     */
    public static DMatrixRMaj covariance(ModeTable table, Field field, List<Vec3> points, int[] components) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(field, "field");
        double[] w = new double[table.size()];
        for (int l = 0; l < w.length; l++) {
            w[l] = table.variance(field, l);
        }
        return of(table, field, points, components, w);
    }

    /**
     * @param table modes (for the mode functions)
     * @param field selects u (A, E) or h (B)
     * @param points the points, metres, finite
     * @param components components per point (each 0..2, distinct)
     * @param weights w_l per mode, finite, length M
     * @return G, row-major, size (points·components)²
     */
    public static DMatrixRMaj of(ModeTable table, Field field, List<Vec3> points, int[] components, double[] weights) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(points, "points");
        Objects.requireNonNull(components, "components");
        Objects.requireNonNull(weights, "weights");
        int m = table.size();
        if (weights.length != m) {
            throw new IllegalArgumentException("weights must hold one value per mode (" + m + "): " + weights.length);
        }
        checkComponents(components);
        int nc = components.length;
        int p = points.size() * nc;
        for (int k = 0; k < points.size(); k++) {
            if (!points.get(k).isFinite()) {
                throw new IllegalArgumentException("points[" + k + "] must be finite: " + points.get(k));
            }
        }
        DMatrixRMaj total = new DMatrixRMaj(p, p);
        DMatrixRMaj part = new DMatrixRMaj(p, p);
        boolean magnetic = field == Field.B;
        for (int from = 0; from < m; from += BLOCK) {
            int to = Math.min(m, from + BLOCK);
            int b = to - from;
            ModeFunctions mf = table.cavity().modeFunctions(table.modes().subList(from, to));
            DMatrixRMaj pos = new DMatrixRMaj(p, b);
            DMatrixRMaj neg = new DMatrixRMaj(p, b);
            boolean anyNeg = false;
            double[] f = new double[3 * b];
            for (int k = 0; k < points.size(); k++) {
                Vec3 r = points.get(k);
                if (magnetic) {
                    mf.evaluate(r.x(), r.y(), r.z(), null, f);
                } else {
                    mf.evaluate(r.x(), r.y(), r.z(), f, null);
                }
                for (int c = 0; c < nc; c++) {
                    int row = (k * nc + c) * b;
                    for (int l = 0; l < b; l++) {
                        double wl = weights[from + l];
                        if (!Double.isFinite(wl)) {
                            throw new IllegalArgumentException("weights[" + (from + l) + "] must be finite: " + wl);
                        }
                        double v = Math.sqrt(Math.abs(wl)) * f[3 * l + components[c]];
                        if (wl >= 0) {
                            pos.data[row + l] = v;
                        } else {
                            neg.data[row + l] = v;
                            anyNeg = true;
                        }
                    }
                }
            }
            CommonOps_DDRM.multOuter(pos, part);
            CommonOps_DDRM.addEquals(total, part);
            if (anyNeg) {
                CommonOps_DDRM.multOuter(neg, part);
                CommonOps_DDRM.subtractEquals(total, part);
            }
        }
        return total;
    }

    static void checkComponents(int[] components) {
        if (components.length < 1 || components.length > 3) {
            throw new IllegalArgumentException("components must name 1 to 3 of 0 (x), 1 (y), 2 (z): "
                + java.util.Arrays.toString(components));
        }
        boolean[] seen = new boolean[3];
        for (int c : components) {
            if (c < 0 || c > 2 || seen[c]) {
                throw new IllegalArgumentException("components must be distinct values in 0..2: "
                    + java.util.Arrays.toString(components));
            }
            seen[c] = true;
        }
    }
}
