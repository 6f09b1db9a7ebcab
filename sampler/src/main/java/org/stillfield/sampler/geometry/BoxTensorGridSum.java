package org.stillfield.sampler.geometry;

import java.util.List;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.TensorGridSum;

/**
 * Box mode sums on a tensor-product grid by three one-axis contractions.
 *
 * <p>Every box mode function component is N·e_i·X(k_x x)·Y(k_y y)·Z(k_z z) with each factor a sine
 * or a cosine of an integer multiple of π x/a (π y/b, π z/d). Gathering the amplitudes into a
 * dense coefficient array c[n][m][l] per component (both polarisations of one (l,m,n) add), the sum
 * over modes on an nx×ny×nz grid is
 * <pre>
 *   T1[n][m][i] = Σ_l c[n][m][l] X[l][i],  T2[n][j][i] = Σ_m T1[n][m][i] Y[m][j],
 *   F[k][j][i]  = Σ_n T2[n][j][i] Z[n][k],
 * </pre>
 * costing (L·M·N·nx + N·M·nx·ny + N·nx·ny·nz) instead of nx·ny·nz·M multiply-adds. z goes last so
 * that the largest step writes whole x-y slabs, which are contiguous in the output.
 *
 * <p>On an axis whose grid is mirror-symmetric about the cavity centre, sin(lπ(a−x)/a) =
 * (−1)^{l+1} sin(lπx/a) and cos(lπ(a−x)/a) = (−1)^l cos(lπx/a): the even-l and odd-l partial sums
 * E and O over the first ⌈n/2⌉ points give E + O there and ±(E − O) at the mirror points (− for
 * sine, + for cosine), which halves that step.
 */
final class BoxTensorGridSum implements TensorGridSum {
    // Output points per z-step pass: keeps the step's source rows (3·N·CHUNK doubles) in cache.
    private static final int CHUNK = 512;

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
    // sin/cos tables, one row per mode index along the axis: t[l][i]
    private final double[][] sx;
    private final double[][] cx;
    private final double[][] sy;
    private final double[][] cy;
    private final double[][] sz;
    private final double[][] cz;
    // Axes whose grid is mirror-symmetric about the cavity centre
    private final boolean fx;
    private final boolean fy;
    private final boolean fz;
    // z's folded half is mirror-symmetric again, about d/4
    private final boolean fz2;
    // sum() runs concurrently; each thread reuses its own scratch.
    private final ThreadLocal<Scratch> scratch = ThreadLocal.withInitial(Scratch::new);

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
            cell[q] = (m.i3() * nm + m.i2()) * nl + m.i1();
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
        fz2 = fz && nz % 2 == 0 && mirrored(java.util.Arrays.copyOf(zs, nz / 2), d / 2, (nn + 1) / 2);
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

    /** t[l][i] = sin or cos(l·step·coords[i]). */
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

    /**
     * One thread's working arrays; every entry read in a call is written earlier in that call.
     * Rows are separate arrays so that every loop indexes all its arrays alike, the form C2
     * vectorises.
     */
    private final class Scratch {
        final double[] c = new double[nl * nm * nn];
        // T1 row (n, m); T2 x-y plane n per component, x fastest
        final double[][] t1 = new double[nn * nm][nx];
        final double[][][] t2 = new double[3][nn][nx * ny];
        final boolean[] live = new boolean[nn * nm];
        final boolean[][] liveN = new boolean[3][nn];
        final Terms terms = new Terms(Math.max(nl, Math.max(nm, nn)), Math.max(nx, nx * ny));
        final double[] third = new double[nx * ny];
    }

    @Override
    public boolean sum(double[] amplitudes, boolean curl, double[] out, int offset) {
        double[] coef = curl ? hk : ue;
        Scratch sc = scratch.get();
        double[] c = sc.c;
        boolean[] zCos = new boolean[3];
        // Every table entry is a sine or cosine, |·| ≤ 1, so every partial sum, folded half and
        // output value is bounded by 2·Σ|a·coef|: a finite, moderate bound proves the grid finite.
        boolean finite = true;
        for (int comp = 0; comp < 3; comp++) {
            java.util.Arrays.fill(c, 0.0);
            double bound = 0.0;
            for (int q = 0; q < nModes; q++) {
                double term = amplitudes[q] * coef[3 * q + comp];
                c[cell[q]] += term;
                bound += Math.abs(term);
            }
            finite &= bound < 1e300;
            // Factor patterns: u = (c s s, s c s, s s c); k·h = (s c c, c s c, c c s).
            boolean xCos = curl ? comp != 0 : comp == 0;
            boolean yCos = curl ? comp != 1 : comp == 1;
            zCos[comp] = curl ? comp != 2 : comp == 2;
            contractXy(sc, xCos, yCos, comp);
        }
        contractZ(sc, zCos, out, offset);
        return finite;
    }

    /**
     * One contraction's term list for one output index: weights and source rows, even mode
     * indices in [0, split) and odd ones in [split, count), plus two scratch rows for the halves.
     */
    private static final class Terms {
        final double[] w;
        final double[][] src;
        final double[] even;
        final double[] odd;
        int split;
        int count;

        Terms(int modes, int len) {
            w = new double[modes];
            src = new double[modes][];
            even = new double[len];
            odd = new double[len];
        }

        void clear() {
            count = 0;
        }

        // Called with all even indices first, then all odd ones; mark() in between.
        void add(double weight, double[] row) {
            w[count] = weight;
            src[count] = row;
            count++;
        }

        void mark() {
            split = count;
        }
    }

    /** T1 and then T2 of one component. */
    private void contractXy(Scratch sc, boolean xCos, boolean yCos, int comp) {
        double[] c = sc.c;
        double[][] t1 = sc.t1;
        double[][] t2 = sc.t2[comp];
        boolean[] live = sc.live;
        boolean[] liveN = sc.liveN[comp];
        Terms tm = sc.terms;
        double[][] tx = xCos ? cx : sx;
        double[][] ty = yCos ? cy : sy;
        // T1[n][m][i] = Σ_l c[n][m][l] X[l][i]; (n, m) rows with no mode (outside the cutoff
        // sphere) are marked dead and skipped in the next step, as are n with no live row.
        java.util.Arrays.fill(liveN, false);
        for (int nmRow = 0; nmRow < nn * nm; nmRow++) {
            tm.clear();
            for (int parity = 0; parity < 2; parity++) {
                for (int l = parity; l < nl; l += 2) {
                    double w = c[nmRow * nl + l];
                    if (w != 0.0) {
                        tm.add(w, tx[l]);
                    }
                }
                if (parity == 0) {
                    tm.mark();
                }
            }
            live[nmRow] = tm.count > 0;
            if (tm.count > 0) {
                liveN[nmRow / nm] = true;
                expand(tm, fx, xCos, t1[nmRow], nx);
            }
        }
        // T2[n][j][i] = Σ_m Y[m][j] T1[n][m][i]
        int hy = fy ? (ny + 1) / 2 : ny;
        for (int n = 0; n < nn; n++) {
            if (!liveN[n]) {
                continue;
            }
            for (int j = 0; j < hy; j++) {
                tm.clear();
                for (int parity = 0; parity < 2; parity++) {
                    for (int m = parity; m < nm; m += 2) {
                        double w = ty[m][j];
                        if (w != 0.0 && live[n * nm + m]) {
                            tm.add(w, t1[n * nm + m]);
                        }
                    }
                    if (parity == 0) {
                        tm.mark();
                    }
                }
                double[] plane = t2[n];
                int dst = j * nx;
                int mirror = (ny - 1 - j) * nx;
                double[] e = tm.even;
                if (!fy || mirror == dst) {
                    combine(tm, 0, tm.count, e, 0, nx);
                    System.arraycopy(e, 0, plane, dst, nx);
                } else {
                    double[] o = tm.odd;
                    combine(tm, 0, tm.split, e, 0, nx);
                    combine(tm, tm.split, tm.count, o, 0, nx);
                    double s = yCos ? 1.0 : -1.0;
                    for (int i = 0; i < nx; i++) {
                        plane[dst + i] = e[i] + o[i];
                        plane[mirror + i] = s * (e[i] - o[i]);
                    }
                }
            }
        }
    }

    /**
     * F[k][j][i] = Σ_n T2[n][j][i] Z[n][k] for all three components, a chunk of x-y points at a
     * time, each output slab written once in interleaved order.
     *
     * <p>When z's folded half is mirror-symmetric about d/4 as well, the even-n part folds again:
     * n = 2n' gives Z(d/2 − z) = ±(−1)^{n'} Z(z) with the same sine/cosine sign, so n ≡ 0 and
     * n ≡ 2 (mod 4) partial sums over a quarter of the points give it at k and hz − 1 − k.
     */
    private void contractZ(Scratch sc, boolean[] zCos, double[] out, int offset) {
        Terms tm = sc.terms;
        int plane = nx * ny;
        int hz = fz ? (nz + 1) / 2 : nz;
        int quarter = fz2 ? hz / 2 : 0;
        for (int p0 = 0; p0 < plane; p0 += CHUNK) {
            int hi = Math.min(plane, p0 + CHUNK);
            for (int k = 0; k < quarter; k++) {
                int kk = hz - 1 - k;
                for (int comp = 0; comp < 3; comp++) {
                    double[][] tz = zCos[comp] ? cz : sz;
                    boolean[] liveN = sc.liveN[comp];
                    double[][] t2 = sc.t2[comp];
                    double s = zCos[comp] ? 1.0 : -1.0;
                    double[] e = tm.even;
                    double[] e2 = sc.third;
                    double[] o = tm.odd;
                    gather(tm, tz, liveN, t2, k, 0, 4);
                    combine(tm, 0, tm.count, e, p0, hi);
                    gather(tm, tz, liveN, t2, k, 2, 4);
                    combine(tm, 0, tm.count, e2, p0, hi);
                    for (int p = p0; p < hi; p++) {
                        double a = e[p];
                        double b = e2[p];
                        e[p] = a + b;
                        e2[p] = s * (a - b);
                    }
                    gather(tm, tz, liveN, t2, k, 1, 2);
                    combine(tm, 0, tm.count, o, p0, hi);
                    writeHalves(out, offset, comp, k, e, o, s, p0, hi);
                    gather(tm, tz, liveN, t2, kk, 1, 2);
                    combine(tm, 0, tm.count, o, p0, hi);
                    writeHalves(out, offset, comp, kk, e2, o, s, p0, hi);
                }
            }
            for (int k = quarter; k < hz - quarter; k++) {
                int mk = nz - 1 - k;
                for (int comp = 0; comp < 3; comp++) {
                    double[][] tz = zCos[comp] ? cz : sz;
                    boolean[] liveN = sc.liveN[comp];
                    double[][] t2 = sc.t2[comp];
                    double[] e = tm.even;
                    if (!fz || mk == k) {
                        gather(tm, tz, liveN, t2, k, 0, 1);
                        combine(tm, 0, tm.count, e, p0, hi);
                        int base = offset + 3 * plane * k + comp;
                        for (int p = p0; p < hi; p++) {
                            out[base + 3 * p] = e[p];
                        }
                    } else {
                        double[] o = tm.odd;
                        gather(tm, tz, liveN, t2, k, 0, 2);
                        combine(tm, 0, tm.count, e, p0, hi);
                        gather(tm, tz, liveN, t2, k, 1, 2);
                        combine(tm, 0, tm.count, o, p0, hi);
                        writeHalves(out, offset, comp, k, e, o, zCos[comp] ? 1.0 : -1.0, p0, hi);
                    }
                }
            }
        }
    }

    /** Terms n = first, first + step, ... of z row k. */
    private void gather(Terms tm, double[][] tz, boolean[] liveN, double[][] t2, int k, int first, int step) {
        tm.clear();
        for (int n = first; n < nn; n += step) {
            double w = tz[n][k];
            if (w != 0.0 && liveN[n]) {
                tm.add(w, t2[n]);
            }
        }
    }

    /** Output rows k and nz − 1 − k of one component from the even and odd halves, points [p0, hi). */
    private void writeHalves(double[] out, int offset, int comp, int k, double[] e, double[] o, double s, int p0, int hi) {
        int plane = nx * ny;
        int base = offset + 3 * plane * k + comp;
        int mbase = offset + 3 * plane * (nz - 1 - k) + comp;
        for (int p = p0; p < hi; p++) {
            out[base + 3 * p] = e[p] + o[p];
            out[mbase + 3 * p] = s * (e[p] - o[p]);
        }
    }

    /**
     * dst = Σ_t w_t·row_t along an axis of len points: directly, or on a mirror-symmetric axis as
     * even and odd halves over the first ⌈len/2⌉ points, unfolded by parity.
     */
    private static void expand(Terms tm, boolean folded, boolean cosine, double[] dst, int len) {
        if (!folded) {
            combine(tm, 0, tm.count, dst, 0, len);
            return;
        }
        int half = (len + 1) / 2;
        double[] e = tm.even;
        double[] o = tm.odd;
        combine(tm, 0, tm.split, e, 0, half);
        combine(tm, tm.split, tm.count, o, 0, half);
        double s = cosine ? 1.0 : -1.0;
        for (int i = 0; i < half; i++) {
            dst[i] = e[i] + o[i];
        }
        for (int i = 0; i < len / 2; i++) {
            dst[len - 1 - i] = s * (e[i] - o[i]);
        }
    }

    /**
     * dst[i] = Σ_{t in [from, to)} w_t·src_t[i] for i in [lo, hi), four source rows per pass so
     * the destination is loaded and stored once per four multiply-adds.
     */
    private static void combine(Terms tm, int from, int to, double[] dst, int lo, int hi) {
        double[] w = tm.w;
        double[][] x = tm.src;
        int t = from;
        switch ((to - from) & 3) {
            case 1 -> {
                set1(w[t], x[t], dst, lo, hi);
                t += 1;
            }
            case 2 -> {
                set2(w[t], w[t + 1], x[t], x[t + 1], dst, lo, hi);
                t += 2;
            }
            case 3 -> {
                set3(w[t], w[t + 1], w[t + 2], x[t], x[t + 1], x[t + 2], dst, lo, hi);
                t += 3;
            }
            default -> {
                if (t == to) {
                    java.util.Arrays.fill(dst, lo, hi, 0.0);
                    return;
                }
                set4(w[t], w[t + 1], w[t + 2], w[t + 3], x[t], x[t + 1], x[t + 2], x[t + 3], dst, lo, hi);
                t += 4;
            }
        }
        for (; t < to; t += 4) {
            add4(w[t], w[t + 1], w[t + 2], w[t + 3], x[t], x[t + 1], x[t + 2], x[t + 3], dst, lo, hi);
        }
    }

    private static void set1(double w0, double[] x0, double[] y, int lo, int hi) {
        for (int i = lo; i < hi; i++) {
            y[i] = w0 * x0[i];
        }
    }

    private static void set2(double w0, double w1, double[] x0, double[] x1, double[] y, int lo, int hi) {
        for (int i = lo; i < hi; i++) {
            y[i] = w0 * x0[i] + w1 * x1[i];
        }
    }

    private static void set3(double w0, double w1, double w2, double[] x0, double[] x1, double[] x2,
                             double[] y, int lo, int hi) {
        for (int i = lo; i < hi; i++) {
            y[i] = w0 * x0[i] + w1 * x1[i] + w2 * x2[i];
        }
    }

    private static void set4(double w0, double w1, double w2, double w3, double[] x0, double[] x1, double[] x2,
                             double[] x3, double[] y, int lo, int hi) {
        for (int i = lo; i < hi; i++) {
            y[i] = w0 * x0[i] + w1 * x1[i] + w2 * x2[i] + w3 * x3[i];
        }
    }

    private static void add4(double w0, double w1, double w2, double w3, double[] x0, double[] x1, double[] x2,
                             double[] x3, double[] y, int lo, int hi) {
        for (int i = lo; i < hi; i++) {
            y[i] += w0 * x0[i] + w1 * x1[i] + w2 * x2[i] + w3 * x3[i];
        }
    }
}
