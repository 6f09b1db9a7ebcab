package org.stillfield.analysis;

import java.util.Map;
import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/**
 * E and B correlations in a PEC box [0,L_x]×[0,L_y]×[0,L_z] with the exponential window, as the sum
 * of the free-space closed form over the box's reflection group (method of images):
 *
 * <pre>
 *   C(r, r′) = Σ_{n ∈ Z³} Σ_{σ ∈ {0,1}³} C0(r − ρ_{n,σ}(r′)) · S_σ,
 *   ρ_{n,σ}(r′)_i = (σ_i ? −r′_i : r′_i) + 2 n_i L_i,
 * </pre>
 *
 * S_σ diagonal, the product over reflected axes i of the single-plane sign: for E, +1 on the
 * component along i and −1 on the others; for B the opposite (a pseudovector). This is an
 * independent route to the box mode sum of {@link ModeSumCorrelation}: expanding C0 in plane waves
 * and summing the images turns the integral over k into the sum over the box's lattice of modes
 * (Poisson summation), so the two agree up to the mode sum's window truncation and this sum's
 * truncation to |n_i| ≤ cells.
 *
 * <p>Convergence: the eight images of one cell n combine into finite differences of C0 along at
 * least two axes, so a cell contributes ~ 1/R⁶ and the truncation error falls like cells⁻³.
 * A is not offered: its kernel falls only as 1/r², and the sum converges too slowly to be a useful
 * reference.
 */
public final class BoxImageSum {
    /** Default truncation |n_i| ≤ 6. */
    public static final int DEFAULT_CELLS = 6;

    private final double[] side;
    private final double a;
    private final Medium medium;
    private final int cells;

    private BoxImageSum(double[] side, double a, Medium medium, int cells) {
        this.side = side;
        this.a = a;
        this.medium = medium;
        this.cells = cells;
    }

    /**
     * @param lx box side along x, metres, positive and finite
     * @param ly box side along y, metres, positive and finite
     * @param lz box side along z, metres, positive and finite
     * @param a window length c_m/ω_c, metres, positive and finite
     * @param medium the filling
     * @param cells truncation |n_i| ≤ cells, 0..64
     * @return the image sum
     */
    public static BoxImageSum of(double lx, double ly, double lz, double a, Medium medium, int cells) {
        positive(lx, "lx");
        positive(ly, "ly");
        positive(lz, "lz");
        positive(a, "a");
        Objects.requireNonNull(medium, "medium");
        if (cells < 0 || cells > 64) {
            throw new IllegalArgumentException("cells must lie in 0..64: " + cells);
        }
        return new BoxImageSum(new double[] {lx, ly, lz}, a, medium, cells);
    }

    /**
     * @param cavity a box ("box" shape with a_m, b_m, d_m)
     * @param window an exponential window
     * @param cells truncation |n_i| ≤ cells
     * @return the image sum for that cavity and window (no truncation of the window)
     */
    public static BoxImageSum of(Cavity cavity, Window window, int cells) {
        Objects.requireNonNull(cavity, "cavity");
        if (!"box".equals(cavity.shape())) {
            throw new IllegalArgumentException("cavity.shape must be box for the image sum: " + cavity.shape());
        }
        Map<String, Double> p = cavity.parameters();
        return of(p.get("a_m"), p.get("b_m"), p.get("d_m"), AnalyticCorrelation.windowLength(window, cavity.medium()),
            cavity.medium(), cells);
    }

    /**
     * @param field E or B
     * @param r first point, metres (inside the box)
     * @param r2 second point, metres (inside the box)
     * @return C_ij(r, r′), (field unit)²
     */
    public double[][] tensor(Field field, Vec3 r, Vec3 r2) {
        Objects.requireNonNull(field, "field");
        if (field == Field.A) {
            throw new IllegalArgumentException("field must be E or B for the image sum (A converges too slowly): A");
        }
        double[] x = {r.x(), r.y(), r.z()};
        double[] y = {r2.x(), r2.y(), r2.z()};
        for (int i = 0; i < 3; i++) {
            if (!(x[i] >= 0 && x[i] <= side[i]) || !(y[i] >= 0 && y[i] <= side[i])) {
                throw new IllegalArgumentException("points must lie inside the box: " + r + ", " + r2);
            }
        }
        double normal = field == Field.B ? -1.0 : 1.0;
        double[][] total = new double[3][3];
        double[] d = new double[3];
        for (int nx = -cells; nx <= cells; nx++) {
            for (int ny = -cells; ny <= cells; ny++) {
                for (int nz = -cells; nz <= cells; nz++) {
                    int[] n = {nx, ny, nz};
                    // One cell's eight images summed first: they nearly cancel, and adding the
                    // small remainder keeps the far cells from eroding the near ones' digits.
                    double[][] cell = new double[3][3];
                    for (int sigma = 0; sigma < 8; sigma++) {
                        double[] s = {1, 1, 1};
                        for (int i = 0; i < 3; i++) {
                            boolean reflect = ((sigma >> i) & 1) == 1;
                            double image = (reflect ? -y[i] : y[i]) + 2 * n[i] * side[i];
                            d[i] = x[i] - image;
                            if (reflect) {
                                for (int j = 0; j < 3; j++) {
                                    s[j] *= j == i ? normal : -normal;
                                }
                            }
                        }
                        double[][] c0 = AnalyticCorrelation.freeSpace(field, new Vec3(d[0], d[1], d[2]), a, medium);
                        for (int i = 0; i < 3; i++) {
                            for (int j = 0; j < 3; j++) {
                                cell[i][j] += c0[i][j] * s[j];
                            }
                        }
                    }
                    for (int i = 0; i < 3; i++) {
                        for (int j = 0; j < 3; j++) {
                            total[i][j] += cell[i][j];
                        }
                    }
                }
            }
        }
        return total;
    }

    private static void positive(double v, String name) {
        if (!(v > 0) || !Double.isFinite(v)) {
            throw new IllegalArgumentException(name + " must be positive and finite (metres): " + v);
        }
    }
}
