package org.stillfield.sampler.geometry;

import java.util.List;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.TensorGridSum;

/**
 * Box mode sums on a tensor-product grid by three one-axis contractions.
 *
 * <p>Every box mode function component is N·e_i·X(k_x x)·Y(k_y y)·Z(k_z z) with each factor a sine
 * or a cosine of an integer multiple of π x/a (π y/b, π z/d). Gathering the amplitudes into a
 * dense coefficient array c[l][m][n] per component (both polarisations of one (l,m,n) add), the sum
 * over modes on an nx×ny×nz grid is
 * <pre>
 *   T1[l][m][k] = Σ_n c[l][m][n] Z[k][n],  T2[l][j][k] = Σ_m T1[l][m][k] Y[j][m],
 *   F[i][j][k]  = Σ_l T2[l][j][k] X[i][l],
 * </pre>
 * costing (L·M·N·nz + L·M·nz·ny + L·ny·nz·nx) instead of nx·ny·nz·M multiply-adds.
 */
final class BoxTensorGridSum implements TensorGridSum {
    private final int nModes;
    private final int nl;
    private final int nm;
    private final int nn;
    private final int nx;
    private final int ny;
    private final int nz;
    private final int[] cell;
    private final double[] ue;
    private final double[] hk;
    // sin/cos tables [grid index][mode index along the axis]
    private final double[][] sx;
    private final double[][] cx;
    private final double[][] sy;
    private final double[][] cy;
    private final double[][] sz;
    private final double[][] cz;

    BoxTensorGridSum(double a, double b, double d, List<Mode> modes, double[] xs, double[] ys, double[] zs) {
        nModes = modes.size();
        int lMax = 0;
        int mMax = 0;
        int nMax = 0;
        for (Mode m : modes) {
            lMax = Math.max(lMax, m.i1());
            mMax = Math.max(mMax, m.i2());
            nMax = Math.max(nMax, m.i3());
        }
        nl = lMax + 1;
        nm = mMax + 1;
        nn = nMax + 1;
        nx = xs.length;
        ny = ys.length;
        nz = zs.length;
        cell = new int[nModes];
        ue = new double[3 * nModes];
        hk = new double[3 * nModes];
        for (int q = 0; q < nModes; q++) {
            Mode m = modes.get(q);
            cell[q] = (m.i1() * nm + m.i2()) * nn + m.i3();
            double[] coef = RectangularCavity.coefficients(m, a, b, d);
            for (int i = 0; i < 3; i++) {
                ue[3 * q + i] = coef[i];
                hk[3 * q + i] = m.k() * coef[3 + i];
            }
        }
        sx = table(xs, nl, Math.PI / a, true);
        cx = table(xs, nl, Math.PI / a, false);
        sy = table(ys, nm, Math.PI / b, true);
        cy = table(ys, nm, Math.PI / b, false);
        sz = table(zs, nn, Math.PI / d, true);
        cz = table(zs, nn, Math.PI / d, false);
    }

    /** Table transposed for axpy loops: t[l][i] = sin or cos(l·step·coords[i]). */
    private static double[][] table(double[] coords, int n, double step, boolean sine) {
        double[][] t = new double[n][coords.length];
        for (int l = 0; l < n; l++) {
            for (int i = 0; i < coords.length; i++) {
                double th = l * step * coords[i];
                t[l][i] = sine ? Math.sin(th) : Math.cos(th);
            }
        }
        return t;
    }

    @Override
    public void sum(double[] amplitudes, boolean curl, double[] out, int offset) {
        double[] coef = curl ? hk : ue;
        double[] c = new double[nl * nm * nn];
        double[] t1 = new double[nl * nm * nz];
        double[] t2 = new double[nl * ny * nz];
        double[] row = new double[nx];
        for (int comp = 0; comp < 3; comp++) {
            java.util.Arrays.fill(c, 0.0);
            for (int q = 0; q < nModes; q++) {
                c[cell[q]] += amplitudes[q] * coef[3 * q + comp];
            }
            // Factor patterns: u = (c s s, s c s, s s c); k·h = (s c c, c s c, c c s).
            boolean xCos = curl ? comp != 0 : comp == 0;
            boolean yCos = curl ? comp != 1 : comp == 1;
            boolean zCos = curl ? comp != 2 : comp == 2;
            contract(c, xCos ? cx : sx, yCos ? cy : sy, zCos ? cz : sz, t1, t2, row, out, offset, comp);
        }
    }

    // Each step is a sequence of axpy updates over a contiguous output run (which the JIT
    // vectorises), instead of strided dot products.
    private void contract(double[] c, double[][] tx, double[][] ty, double[][] tz, double[] t1, double[] t2,
                          double[] row, double[] out, int offset, int comp) {
        // T1[l][m][k] = Σ_n c[l][m][n] Z[n][k]; (l, m) rows with no mode (outside the cutoff
        // sphere) stay zero and are skipped in the next step.
        java.util.Arrays.fill(t1, 0.0);
        boolean[] live = new boolean[nl * nm];
        for (int lm = 0; lm < nl * nm; lm++) {
            int dst = lm * nz;
            for (int n = 0; n < nn; n++) {
                double w = c[lm * nn + n];
                if (w != 0.0) {
                    axpy(w, tz[n], 0, t1, dst, nz);
                    live[lm] = true;
                }
            }
        }
        // T2[l][j][k] = Σ_m Y[m][j] T1[l][m][k]
        java.util.Arrays.fill(t2, 0.0);
        for (int l = 0; l < nl; l++) {
            for (int j = 0; j < ny; j++) {
                int dst = (l * ny + j) * nz;
                for (int m = 0; m < nm; m++) {
                    double w = ty[m][j];
                    if (w != 0.0 && live[l * nm + m]) {
                        axpy(w, t1, (l * nm + m) * nz, t2, dst, nz);
                    }
                }
            }
        }
        // F[k][j][i] = Σ_l T2[l][j][k] X[l][i], x fastest, scattered into the interleaved output.
        for (int k = 0; k < nz; k++) {
            for (int j = 0; j < ny; j++) {
                java.util.Arrays.fill(row, 0.0);
                for (int l = 0; l < nl; l++) {
                    double w = t2[(l * ny + j) * nz + k];
                    if (w != 0.0) {
                        axpy(w, tx[l], 0, row, 0, nx);
                    }
                }
                int base = offset + 3 * nx * (j + ny * k) + comp;
                for (int i = 0; i < nx; i++) {
                    out[base + 3 * i] = row[i];
                }
            }
        }
    }

    private static void axpy(double w, double[] x, int xOff, double[] y, int yOff, int n) {
        for (int i = 0; i < n; i++) {
            y[yOff + i] += w * x[xOff + i];
        }
    }
}
