package org.stillfield.sampler.geometry;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.TensorGridSum;
import org.stillfield.sampler.api.Vec3;

/**
 * PEC rectangular box [0,a]×[0,b]×[0,d] (PHYSICS.md §1; resonances as in Pozar, Microwave
 * Engineering, rectangular cavity section).
 *
 * <p>k = (lπ/a, mπ/b, nπ/d) with integers ≥ 0, at most one zero. Mode functions
 * <pre>
 *   u = N (e_x cos(k_x x) sin(k_y y) sin(k_z z), e_y sin cos sin, e_z sin sin cos)
 *   h = N/k (k×e) with the pattern (sin cos cos, cos sin cos, cos cos sin)
 * </pre>
 * with N = √8 when all indices are positive (two polarisations) and N = 2 when one is zero (e
 * along that index's axis). Polarisations are named with respect to the z axis: TE has E_z = 0,
 * e = ẑ×k̂/|ẑ×k̂|; TM has e = (−k_xk_z, −k_yk_z, k_ρ²)/(k_ρ k). With one zero index the mode is
 * TM when n = 0 (e = ẑ) and TE otherwise. Labels are (family, l, m, n), orientation 0.
 */
public final class RectangularCavity implements Cavity {
    private final double a;
    private final double b;
    private final double d;
    private final Medium medium;

    private RectangularCavity(double a, double b, double d, Medium medium) {
        this.a = a;
        this.b = b;
        this.d = d;
        this.medium = medium;
    }

    /**
     * @param aMetres length along x, positive and finite
     * @param bMetres length along y, positive and finite
     * @param dMetres length along z, positive and finite
     * @param medium filling
     * @return the cavity
     */
    public static RectangularCavity of(double aMetres, double bMetres, double dMetres, Medium medium) {
        Checks.positiveLength(aMetres, "cavity.a_m");
        Checks.positiveLength(bMetres, "cavity.b_m");
        Checks.positiveLength(dMetres, "cavity.d_m");
        return new RectangularCavity(aMetres, bMetres, dMetres, Objects.requireNonNull(medium, "medium"));
    }

    @Override
    public String shape() {
        return "box";
    }

    @Override
    public Map<String, Double> parameters() {
        Map<String, Double> p = new LinkedHashMap<>();
        p.put("a_m", a);
        p.put("b_m", b);
        p.put("d_m", d);
        return p;
    }

    @Override
    public Medium medium() {
        return medium;
    }

    @Override
    public double volume() {
        return a * b * d;
    }

    @Override
    public Vec3[] bounds() {
        return new Vec3[] {Vec3.ZERO, new Vec3(a, b, d)};
    }

    @Override
    public boolean contains(Vec3 r) {
        return r.x() >= 0 && r.x() <= a && r.y() >= 0 && r.y() <= b && r.z() >= 0 && r.z() <= d;
    }

    /**
     * Weyl's law with the edge correction for a PEC box, N(k) ≈ Vk³/(3π²) − (a+b+d)k/(2π) + 1/2
     * (Balian &amp; Bloch 1971; Baltes &amp; Hilf 1976; source from memory, the constant 1/2 derived).
     */
    @Override
    public double weylCount(double k) {
        return Math.max(0.0, volume() * k * k * k / (3 * Math.PI * Math.PI) - (a + b + d) * k / (2 * Math.PI) + 0.5);
    }

    @Override
    public double lowestK() {
        double ia = 1 / (a * a);
        double ib = 1 / (b * b);
        double id = 1 / (d * d);
        return Math.PI * Math.sqrt(Math.min(ia + ib, Math.min(ia + id, ib + id)));
    }

    @Override
    public List<Mode> modesUpTo(double kMax) {
        if (!(kMax > 0) || !Double.isFinite(kMax)) {
            throw new IllegalArgumentException("kMax must be positive and finite: " + kMax);
        }
        int lMax = (int) Math.floor(kMax * a / Math.PI);
        int mMax = (int) Math.floor(kMax * b / Math.PI);
        int nMax = (int) Math.floor(kMax * d / Math.PI);
        double k2Max = kMax * kMax;
        List<Mode> out = new ArrayList<>();
        for (int l = 0; l <= lMax; l++) {
            double kx = l * Math.PI / a;
            for (int m = 0; m <= mMax; m++) {
                double ky = m * Math.PI / b;
                double kxy2 = kx * kx + ky * ky;
                if (kxy2 > k2Max) {
                    break;
                }
                for (int n = 0; n <= nMax; n++) {
                    int zeros = (l == 0 ? 1 : 0) + (m == 0 ? 1 : 0) + (n == 0 ? 1 : 0);
                    if (zeros >= 2) {
                        continue;
                    }
                    double kz = n * Math.PI / d;
                    double k2 = kxy2 + kz * kz;
                    if (k2 > k2Max) {
                        break;
                    }
                    double k = Math.sqrt(k2);
                    if (zeros == 1) {
                        out.add(new Mode(n == 0 ? "TM" : "TE", l, m, n, 0, k));
                    } else {
                        out.add(new Mode("TE", l, m, n, 0, k));
                        out.add(new Mode("TM", l, m, n, 0, k));
                    }
                }
            }
        }
        out.sort(ORDER);
        return out;
    }

    /**
     * The constant vectors of one box mode: {N e_x, N e_y, N e_z, N (k×e)_x/k, N (k×e)_y/k, N (k×e)_z/k},
     * so that u_i = coef[i]·(trig pattern of u) and h_i = coef[3+i]·(trig pattern of h).
     */
    static double[] coefficients(Mode mode, double a, double b, double d) {
        int l = mode.i1();
        int m = mode.i2();
        int n = mode.i3();
        double kx = l * Math.PI / a;
        double ky = m * Math.PI / b;
        double kz = n * Math.PI / d;
        double k = Math.sqrt(kx * kx + ky * ky + kz * kz);
        int zeros = (l == 0 ? 1 : 0) + (m == 0 ? 1 : 0) + (n == 0 ? 1 : 0);
        double ex;
        double ey;
        double ez;
        double norm;
        if (zeros == 1) {
            norm = 2.0;
            ex = l == 0 ? 1 : 0;
            ey = m == 0 ? 1 : 0;
            ez = n == 0 ? 1 : 0;
        } else if (zeros == 0) {
            norm = Math.sqrt(8.0);
            double kr = Math.hypot(kx, ky);
            if ("TE".equals(mode.family())) {
                ex = -ky / kr;
                ey = kx / kr;
                ez = 0;
            } else {
                ex = -kx * kz / (kr * k);
                ey = -ky * kz / (kr * k);
                ez = kr / k;
            }
        } else {
            throw new IllegalArgumentException("not a box mode (two or more zero indices): " + mode.label());
        }
        return new double[] {norm * ex, norm * ey, norm * ez,
            norm * (ky * ez - kz * ey) / k, norm * (kz * ex - kx * ez) / k, norm * (kx * ey - ky * ex) / k};
    }

    /** Frequency order, ties broken by label so the list is the same on every machine. */
    static final Comparator<Mode> ORDER = Comparator.comparingDouble(Mode::k)
        .thenComparing(Mode::family)
        .thenComparingInt(Mode::i1)
        .thenComparingInt(Mode::i2)
        .thenComparingInt(Mode::i3)
        .thenComparingInt(Mode::orientation);

    @Override
    public ModeFunctions modeFunctions(List<Mode> modes) {
        return new BoxModeFunctions(modes);
    }

    @Override
    public TensorGridSum tensorGridSum(List<Mode> modes, double[] xs, double[] ys, double[] zs) {
        return new BoxTensorGridSum(a, b, d, modes, xs, ys, zs);
    }

    /**
     * Precomputes N·e and N·(k×e)/k per mode and evaluates the trigonometric factors once per
     * distinct index along each axis, so a point costs O(l_max + m_max + n_max) sin/cos calls plus
     * O(M) multiplications.
     */
    private final class BoxModeFunctions implements ModeFunctions {
        private final int count;
        private final int[] il;
        private final int[] im;
        private final int[] in;
        private final double[] ue;
        private final double[] he;
        private final int lMax;
        private final int mMax;
        private final int nMax;

        BoxModeFunctions(List<Mode> modes) {
            count = modes.size();
            il = new int[count];
            im = new int[count];
            in = new int[count];
            ue = new double[3 * count];
            he = new double[3 * count];
            int lm = 0;
            int mm = 0;
            int nm = 0;
            for (int q = 0; q < count; q++) {
                Mode mode = modes.get(q);
                int l = mode.i1();
                int m = mode.i2();
                int n = mode.i3();
                il[q] = l;
                im[q] = m;
                in[q] = n;
                lm = Math.max(lm, l);
                mm = Math.max(mm, m);
                nm = Math.max(nm, n);
                double[] coef = coefficients(mode, a, b, d);
                System.arraycopy(coef, 0, ue, 3 * q, 3);
                System.arraycopy(coef, 3, he, 3 * q, 3);
            }
            lMax = lm;
            mMax = mm;
            nMax = nm;
        }

        @Override
        public int modeCount() {
            return count;
        }

        @Override
        public void evaluate(double x, double y, double z, double[] u, double[] h) {
            double[] sx = new double[lMax + 1];
            double[] cx = new double[lMax + 1];
            double[] sy = new double[mMax + 1];
            double[] cy = new double[mMax + 1];
            double[] sz = new double[nMax + 1];
            double[] cz = new double[nMax + 1];
            trig(Math.PI * x / a, sx, cx);
            trig(Math.PI * y / b, sy, cy);
            trig(Math.PI * z / d, sz, cz);
            for (int q = 0; q < count; q++) {
                int l = il[q];
                int m = im[q];
                int n = in[q];
                int j = 3 * q;
                if (u != null) {
                    u[j] = ue[j] * cx[l] * sy[m] * sz[n];
                    u[j + 1] = ue[j + 1] * sx[l] * cy[m] * sz[n];
                    u[j + 2] = ue[j + 2] * sx[l] * sy[m] * cz[n];
                }
                if (h != null) {
                    h[j] = he[j] * sx[l] * cy[m] * cz[n];
                    h[j + 1] = he[j + 1] * cx[l] * sy[m] * cz[n];
                    h[j + 2] = he[j + 2] * cx[l] * cy[m] * sz[n];
                }
            }
        }

        // Direct sin/cos per index: a recurrence would save calls but loses ~1 ulp per step.
        private void trig(double theta, double[] s, double[] c) {
            for (int i = 0; i < s.length; i++) {
                s[i] = Math.sin(i * theta);
                c[i] = Math.cos(i * theta);
            }
        }
    }
}
