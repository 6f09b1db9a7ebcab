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
    // sin/cos tables, row per mode index along the axis: t[l * points + i]
    private final double[] sx;
    private final double[] cx;
    private final double[] sy;
    private final double[] cy;
    private final double[] sz;
    private final double[] cz;
    // Axes whose grid is mirror-symmetric about the cavity centre, and ⌈n/2⌉ along y
    private final boolean fx;
    private final boolean fy;
    private final boolean fz;
    private final int hy;

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
        fx = mirrored(xs, a, nl);
        fy = mirrored(ys, b, nm);
        fz = mirrored(zs, d, nn);
        hy = fy ? (ny + 1) / 2 : ny;
    }

    /**
     * Whether x_i + x_{n-1-i} = a for all i, so that sin and cos of lπ(a − x)/a are ±sin, ±cos of
     * lπx/a. A mismatch δ shifts the phase of index l by lπδ/a: allow 1e-13 of phase at the top
     * index, but never less than the few ulps a computed grid carries.
     */
    private static boolean mirrored(double[] coords, double a, int modes) {
        double tol = Math.max(4 * Math.ulp(a), 1e-13 * a / (Math.PI * Math.max(1, modes - 1)));
        int n = coords.length;
        for (int i = 0; i < n; i++) {
            if (!(Math.abs(coords[i] + coords[n - 1 - i] - a) <= tol)) {
                return false;
            }
        }
        return true;
    }

    /** t[l * coords.length + i] = sin or cos(l·step·coords[i]). */
    private static double[] table(double[] coords, int n, double step, boolean sine) {
        int len = coords.length;
        double[] t = new double[n * len];
        for (int l = 0; l < n; l++) {
            for (int i = 0; i < len; i++) {
                double th = l * step * coords[i];
                t[l * len + i] = sine ? Math.sin(th) : Math.cos(th);
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
        Terms terms = new Terms(Math.max(nl, Math.max(nm, nn)), Math.max(nx, Math.max(ny, nz)));
        for (int comp = 0; comp < 3; comp++) {
            java.util.Arrays.fill(c, 0.0);
            for (int q = 0; q < nModes; q++) {
                c[cell[q]] += amplitudes[q] * coef[3 * q + comp];
            }
            // Factor patterns: u = (c s s, s c s, s s c); k·h = (s c c, c s c, c c s).
            boolean xCos = curl ? comp != 0 : comp == 0;
            boolean yCos = curl ? comp != 1 : comp == 1;
            boolean zCos = curl ? comp != 2 : comp == 2;
            contract(c, xCos, yCos, zCos, t1, t2, row, terms, out, offset, comp);
        }
    }

    /**
     * One contraction's term list for one output index: weights and source offsets, even mode
     * indices in [0, split) and odd ones in [split, count), plus two scratch rows for the halves.
     */
    private static final class Terms {
        final double[] w;
        final int[] off;
        final double[] even;
        final double[] odd;
        int split;
        int count;

        Terms(int modes, int len) {
            w = new double[modes];
            off = new int[modes];
            even = new double[len];
            odd = new double[len];
        }

        void clear() {
            count = 0;
        }

        // Called with all even indices first, then all odd ones; mark() in between.
        void add(double weight, int offset) {
            w[count] = weight;
            off[count] = offset;
            count++;
        }

        void mark() {
            split = count;
        }
    }

    private void contract(double[] c, boolean xCos, boolean yCos, boolean zCos, double[] t1, double[] t2,
                          double[] row, Terms tm, double[] out, int offset, int comp) {
        double[] tx = xCos ? cx : sx;
        double[] ty = yCos ? cy : sy;
        double[] tz = zCos ? cz : sz;
        // T1[l][m][k] = Σ_n c[l][m][n] Z[n][k]; (l, m) rows with no mode (outside the cutoff
        // sphere) are marked dead and skipped in the next step.
        boolean[] live = new boolean[nl * nm];
        for (int lm = 0; lm < nl * nm; lm++) {
            tm.clear();
            for (int parity = 0; parity < 2; parity++) {
                for (int n = parity; n < nn; n += 2) {
                    double w = c[lm * nn + n];
                    if (w != 0.0) {
                        tm.add(w, n * nz);
                    }
                }
                if (parity == 0) {
                    tm.mark();
                }
            }
            if (tm.count > 0) {
                live[lm] = true;
                expand(tm, tz, fz, zCos, t1, lm * nz, nz);
            }
        }
        // T2[l][j][k] = Σ_m Y[m][j] T1[l][m][k]
        for (int l = 0; l < nl; l++) {
            for (int j = 0; j < hy; j++) {
                tm.clear();
                for (int parity = 0; parity < 2; parity++) {
                    for (int m = parity; m < nm; m += 2) {
                        double w = ty[m * ny + j];
                        if (w != 0.0 && live[l * nm + m]) {
                            tm.add(w, (l * nm + m) * nz);
                        }
                    }
                    if (parity == 0) {
                        tm.mark();
                    }
                }
                int dst = (l * ny + j) * nz;
                int mirror = (l * ny + ny - 1 - j) * nz;
                if (!fy || mirror == dst) {
                    combine(t1, tm, 0, tm.count, t2, dst, nz);
                } else {
                    combine(t1, tm, 0, tm.split, t2, dst, nz);
                    combine(t1, tm, tm.split, tm.count, t2, mirror, nz);
                    butterfly(t2, dst, t2, mirror, nz, yCos ? 1.0 : -1.0);
                }
            }
        }
        // F[k][j][i] = Σ_l T2[l][j][k] X[l][i], x fastest, scattered into the interleaved output.
        for (int k = 0; k < nz; k++) {
            for (int j = 0; j < ny; j++) {
                tm.clear();
                for (int parity = 0; parity < 2; parity++) {
                    for (int l = parity; l < nl; l += 2) {
                        double w = t2[(l * ny + j) * nz + k];
                        if (w != 0.0) {
                            tm.add(w, l * nx);
                        }
                    }
                    if (parity == 0) {
                        tm.mark();
                    }
                }
                expand(tm, tx, fx, xCos, row, 0, nx);
                int base = offset + 3 * nx * (j + ny * k) + comp;
                for (int i = 0; i < nx; i++) {
                    out[base + 3 * i] = row[i];
                }
            }
        }
    }

    /**
     * dst[d, d+len) = Σ_t w_t·table[off_t + i] along an axis of len points: directly, or on a
     * mirror-symmetric axis as even and odd halves over the first ⌈len/2⌉ points, unfolded by parity.
     */
    private static void expand(Terms tm, double[] table, boolean folded, boolean cosine, double[] dst, int d, int len) {
        if (!folded) {
            combine(table, tm, 0, tm.count, dst, d, len);
            return;
        }
        int half = (len + 1) / 2;
        combine(table, tm, 0, tm.split, tm.even, 0, half);
        combine(table, tm, tm.split, tm.count, tm.odd, 0, half);
        double s = cosine ? 1.0 : -1.0;
        double[] e = tm.even;
        double[] o = tm.odd;
        for (int i = 0; i < half; i++) {
            dst[d + i] = e[i] + o[i];
        }
        for (int i = 0; i < len / 2; i++) {
            dst[d + len - 1 - i] = s * (e[i] - o[i]);
        }
    }

    /** (a, b) ← (a + b, s·(a − b)) elementwise: even and odd halves to a point and its mirror. */
    private static void butterfly(double[] x, int a, double[] y, int b, int len, double s) {
        for (int i = 0; i < len; i++) {
            double e = x[a + i];
            double o = y[b + i];
            x[a + i] = e + o;
            y[b + i] = s * (e - o);
        }
    }

    /**
     * dst[d, d+len) = Σ_{t in [from, to)} w_t·src[off_t, off_t+len), four source rows per pass so
     * the destination is loaded and stored once per four multiply-adds.
     */
    private static void combine(double[] src, Terms tm, int from, int to, double[] dst, int d, int len) {
        double[] w = tm.w;
        int[] off = tm.off;
        int t = from;
        switch ((to - from) & 3) {
            case 1 -> {
                set1(w[t], src, off[t], dst, d, len);
                t += 1;
            }
            case 2 -> {
                set2(w[t], w[t + 1], src, off[t], off[t + 1], dst, d, len);
                t += 2;
            }
            case 3 -> {
                set2(w[t], w[t + 1], src, off[t], off[t + 1], dst, d, len);
                add1(w[t + 2], src, off[t + 2], dst, d, len);
                t += 3;
            }
            default -> {
                if (t == to) {
                    java.util.Arrays.fill(dst, d, d + len, 0.0);
                    return;
                }
                set4(w[t], w[t + 1], w[t + 2], w[t + 3], src, off[t], off[t + 1], off[t + 2], off[t + 3], dst, d, len);
                t += 4;
            }
        }
        for (; t < to; t += 4) {
            add4(w[t], w[t + 1], w[t + 2], w[t + 3], src, off[t], off[t + 1], off[t + 2], off[t + 3], dst, d, len);
        }
    }

    private static void set1(double w0, double[] x, int o0, double[] y, int d, int n) {
        for (int i = 0; i < n; i++) {
            y[d + i] = w0 * x[o0 + i];
        }
    }

    private static void set2(double w0, double w1, double[] x, int o0, int o1, double[] y, int d, int n) {
        for (int i = 0; i < n; i++) {
            y[d + i] = w0 * x[o0 + i] + w1 * x[o1 + i];
        }
    }

    private static void add1(double w0, double[] x, int o0, double[] y, int d, int n) {
        for (int i = 0; i < n; i++) {
            y[d + i] += w0 * x[o0 + i];
        }
    }

    private static void set4(double w0, double w1, double w2, double w3, double[] x, int o0, int o1, int o2, int o3,
                             double[] y, int d, int n) {
        for (int i = 0; i < n; i++) {
            y[d + i] = w0 * x[o0 + i] + w1 * x[o1 + i] + w2 * x[o2 + i] + w3 * x[o3 + i];
        }
    }

    private static void add4(double w0, double w1, double w2, double w3, double[] x, int o0, int o1, int o2, int o3,
                             double[] y, int d, int n) {
        for (int i = 0; i < n; i++) {
            y[d + i] += w0 * x[o0 + i] + w1 * x[o1 + i] + w2 * x[o2 + i] + w3 * x[o3 + i];
        }
    }
}
