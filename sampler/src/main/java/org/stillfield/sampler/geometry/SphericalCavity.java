package org.stillfield.sampler.geometry;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.Vec3;

/**
 * PEC sphere of radius R centred at (R, R, R), bounding box [0,2R]³ (PHYSICS.md §1; the
 * multipole construction of e.g. Jackson, Classical Electrodynamics, §9.7 and §8.9, source from
 * memory).
 *
 * <p>With ê the unit vector from the centre, s the distance, x = ks and Y a real spherical
 * harmonic written as a homogeneous polynomial S(r) = s^n Y (a solid harmonic, so T = ∇S(ê) is a
 * polynomial in ê with no pole singularity):
 * <pre>
 *   M = j_n(x) (T × ê),   N = (1/k)∇×M = ([x j_n]′/x) T + n j_{n+1}(x) Y ê,
 * </pre>
 * where [x j_n]′/x = (n+1) j_n/x − j_{n+1} (A&amp;S 10.1.22) is finite at x = 0. TE_n: u = A M, h = A N,
 * with j_n(kR) = 0 (n×M = 0 on the wall); TM_n: u = A N, h = A M, with [x j_n]′ = 0 at kR
 * (tangential N vanishes). n ≥ 1, radial index l ≥ 1 counts the zeros.
 *
 * <p>Normalisation, from ∫|T × ê|² dΩ = ∫|∇_Ω Y|² dΩ = n(n+1) and
 * ∫_0^R j_n(ks)² s² ds = (R³/2)[j_n² − j_{n−1}j_{n+1}](kR) (the spherical form of Lommel's
 * integral with j_n = √(π/2x) J_{n+½}; source from memory, verified by quadrature in the tests); for TM ∫|N|² = ∫|M|² because the wall term of Green's identity
 * vanishes with the tangential N:
 * <pre>
 *   TE: A² = 8π / (3 n(n+1) j_{n+1}(kR)²),   TM: A² = 8π / (3 n(n+1) [j_n² − j_{n−1}j_{n+1}](kR)).
 * </pre>
 *
 * <p>Real harmonics, orthonormal on the unit sphere: orientation 0 is m = 0, 2m−1 is cos mφ and
 * 2m is sin mφ (m = 1…n), φ measured about the z axis. They are built from Q_n^m = P_n^m/sin^mθ
 * (a polynomial in cos θ; fully normalised three-term recurrences as in geodesy, e.g. Holmes &amp;
 * Featherstone 2002, source from memory) times Re/Im (ê_x + iê_y)^m. Labels: (family, n, l, 0),
 * orientation 0…2n.
 */
public final class SphericalCavity implements Cavity {
    private final double radius;
    private final Medium medium;

    private SphericalCavity(double radius, Medium medium) {
        this.radius = radius;
        this.medium = medium;
    }

    /**
     * @param radiusMetres radius R, positive and finite
     * @param medium filling
     * @return the cavity
     */
    public static SphericalCavity of(double radiusMetres, Medium medium) {
        Checks.positiveLength(radiusMetres, "cavity.radius_m");
        return new SphericalCavity(radiusMetres, Objects.requireNonNull(medium, "medium"));
    }

    @Override
    public String shape() {
        return "sphere";
    }

    @Override
    public Map<String, Double> parameters() {
        Map<String, Double> p = new LinkedHashMap<>();
        p.put("radius_m", radius);
        return p;
    }

    @Override
    public Medium medium() {
        return medium;
    }

    @Override
    public double volume() {
        return 4.0 / 3.0 * Math.PI * radius * radius * radius;
    }

    @Override
    public Vec3[] bounds() {
        return new Vec3[] {Vec3.ZERO, new Vec3(2 * radius, 2 * radius, 2 * radius)};
    }

    /** Inside or on the wall; 1e-13 R of slack so that wall points computed in floating point count. */
    @Override
    public boolean contains(Vec3 r) {
        double dx = r.x() - radius;
        double dy = r.y() - radius;
        double dz = r.z() - radius;
        return Math.sqrt(dx * dx + dy * dy + dz * dz) <= radius * (1 + 1e-13);
    }

    /**
     * N(k) ≈ Vk³/(3π²) − (8/(3π)) kR, derived here. For a smooth PEC wall the k² surface term
     * cancels between the polarisations, and the O(k) term is local and linear in the principal
     * curvatures, −(k/(3π²))∫(κ1 + κ2) dS (cf. Balian &amp; Bloch, Ann. Phys. 64, 271 (1971), source
     * from memory). The coefficient is the one the cylinder's exact separable count gives for its
     * side wall (see {@link CylindricalCavity#weylCount}); for the sphere ∫(κ1 + κ2) dS = 8πR.
     * The residual bound the tests accept is empirical.
     */
    @Override
    public double weylCount(double k) {
        double x = k * radius;
        return Math.max(0.0, volume() * k * k * k / (3 * Math.PI * Math.PI) - 8 * x / (3 * Math.PI));
    }

    @Override
    public double lowestK() {
        return BesselZeros.first(BesselZeros.Kind.SPHERICAL_RICCATI_PRIME, 1, 1)[0] / radius;
    }

    @Override
    public List<Mode> modesUpTo(double kMax) {
        if (!(kMax > 0) || !Double.isFinite(kMax)) {
            throw new IllegalArgumentException("kMax must be positive and finite: " + kMax);
        }
        double xMax = kMax * radius;
        List<Mode> out = new ArrayList<>();
        for (int n = 1; ; n++) {
            double[] te = BesselZeros.upTo(BesselZeros.Kind.SPHERICAL_J, n, xMax);
            double[] tm = BesselZeros.upTo(BesselZeros.Kind.SPHERICAL_RICCATI_PRIME, n, xMax);
            if (te.length == 0 && tm.length == 0) {
                // First zeros of both kinds grow with n, so no higher order has one.
                break;
            }
            add(out, "TE", n, te);
            add(out, "TM", n, tm);
        }
        out.sort(RectangularCavity.ORDER);
        return out;
    }

    private void add(List<Mode> out, String family, int n, double[] zeros) {
        for (int l = 0; l < zeros.length; l++) {
            double k = zeros[l] / radius;
            for (int o = 0; o <= 2 * n; o++) {
                out.add(new Mode(family, n, l + 1, 0, o, k));
            }
        }
    }

    @Override
    public ModeFunctions modeFunctions(List<Mode> modes) {
        return new SphereModeFunctions(modes);
    }

    /**
     * Per point: the harmonics T, Y of every (n, orientation) up to n_max (O(n_max²) work), one
     * Miller recurrence per distinct radial function, then a cross product per mode.
     */
    private final class SphereModeFunctions implements ModeFunctions {
        private final int count;
        private final int[] radialOf;
        private final int[] angularOf;
        private final boolean[] tm;
        private final double[] amp;
        private final int[] radialOrder;
        private final double[] radialK;
        private final int nMax;

        SphereModeFunctions(List<Mode> modes) {
            count = modes.size();
            radialOf = new int[count];
            angularOf = new int[count];
            tm = new boolean[count];
            amp = new double[count];
            Map<Long, Integer> needed = new HashMap<>();
            for (Mode mode : modes) {
                boolean isTm = Checks.isTm(mode, "sphere");
                int n = mode.i1();
                if (n < 1 || mode.i2() < 1 || mode.i3() != 0 || mode.orientation() < 0 || mode.orientation() > 2 * n) {
                    throw new IllegalArgumentException("not a sphere mode: " + mode.label());
                }
                needed.merge(Checks.radialKey(isTm, n), mode.i2(), Math::max);
            }
            Map<Long, double[]> zeros = new HashMap<>();
            for (Map.Entry<Long, Integer> e : needed.entrySet()) {
                boolean isTm = (e.getKey() & 1L) == 1L;
                int n = (int) (e.getKey() >> 1);
                BesselZeros.Kind kind = isTm ? BesselZeros.Kind.SPHERICAL_RICCATI_PRIME : BesselZeros.Kind.SPHERICAL_J;
                zeros.put(e.getKey(), BesselZeros.first(kind, n, e.getValue()));
            }
            Map<Long, Integer> radialIndex = new HashMap<>();
            List<Integer> orders = new ArrayList<>();
            List<Double> ks = new ArrayList<>();
            List<Double> amps = new ArrayList<>();
            int nm = 0;
            double[] t = new double[4];
            for (int q = 0; q < count; q++) {
                Mode mode = modes.get(q);
                boolean isTm = Checks.isTm(mode, "sphere");
                int n = mode.i1();
                int l = mode.i2();
                double x = zeros.get(Checks.radialKey(isTm, n))[l - 1];
                long rk = (Checks.radialKey(isTm, n) << 20) | l;
                Integer r = radialIndex.get(rk);
                if (r == null) {
                    r = orders.size();
                    radialIndex.put(rk, r);
                    orders.add(n);
                    ks.add(x / radius);
                    BesselFunctions.spherical(n, x, t);
                    double radial = isTm ? t[1] * t[1] - t[0] * t[2] : t[2] * t[2];
                    amps.add(Math.sqrt(8 * Math.PI / (3.0 * n * (n + 1) * radial)));
                }
                radialOf[q] = r;
                angularOf[q] = n * n - 1 + mode.orientation();
                tm[q] = isTm;
                amp[q] = amps.get(r);
                nm = Math.max(nm, n);
            }
            radialOrder = new int[orders.size()];
            radialK = new double[orders.size()];
            for (int r = 0; r < radialOrder.length; r++) {
                radialOrder[r] = orders.get(r);
                radialK[r] = ks.get(r);
            }
            nMax = nm;
        }


        @Override
        public int modeCount() {
            return count;
        }

        @Override
        public void evaluate(double x, double y, double z, double[] u, double[] h) {
            double dx = x - radius;
            double dy = y - radius;
            double dz = z - radius;
            double s = Math.sqrt(dx * dx + dy * dy + dz * dz);
            // At the centre the direction is arbitrary: only n = 1 N survives there, and its T is constant.
            double ex = s > 0 ? dx / s : 0.0;
            double ey = s > 0 ? dy / s : 0.0;
            double ez = s > 0 ? dz / s : 1.0;
            int entries = (nMax + 1) * (nMax + 1) - 1;
            double[] yv = new double[entries];
            double[] tv = new double[3 * entries];
            harmonics(ex, ey, ez, yv, tv);
            int nr = radialOrder.length;
            double[] mf = new double[nr];
            double[] n1 = new double[nr];
            double[] n2 = new double[nr];
            double[] t = new double[4];
            for (int r = 0; r < nr; r++) {
                int n = radialOrder[r];
                BesselFunctions.spherical(n, radialK[r] * s, t);
                mf[r] = t[1];
                n1[r] = (n + 1) * t[3] - t[2];
                n2[r] = n * t[2];
            }
            for (int q = 0; q < count; q++) {
                int r = radialOf[q];
                int a = angularOf[q];
                double tx = tv[3 * a];
                double ty = tv[3 * a + 1];
                double tz = tv[3 * a + 2];
                double yy = yv[a];
                double mfac = amp[q] * mf[r];
                double mx = mfac * (ty * ez - tz * ey);
                double my = mfac * (tz * ex - tx * ez);
                double mz = mfac * (tx * ey - ty * ex);
                double c1 = amp[q] * n1[r];
                double c2 = amp[q] * n2[r] * yy;
                double nx = c1 * tx + c2 * ex;
                double ny = c1 * ty + c2 * ey;
                double nz = c1 * tz + c2 * ez;
                int j = 3 * q;
                boolean electricIsN = tm[q];
                if (u != null) {
                    u[j] = electricIsN ? nx : mx;
                    u[j + 1] = electricIsN ? ny : my;
                    u[j + 2] = electricIsN ? nz : mz;
                }
                if (h != null) {
                    h[j] = electricIsN ? mx : nx;
                    h[j + 1] = electricIsN ? my : ny;
                    h[j + 2] = electricIsN ? mz : nz;
                }
            }
        }

        /**
         * Y and T = ∇S at the unit vector ê for n = 1…n_max, all orientations; entry n² − 1 + o.
         * S = Q̄_n^m(z) W with W = Re or Im (x + iy)^m extended homogeneously, so
         * ∇S(ê) = W[(n − m) Q̄ ê + Q̄′ (ẑ − z ê)] + Q̄ ∇W.
         */
        private void harmonics(double ex, double ey, double ez, double[] yv, double[] tv) {
            double cPrev = 0.0;
            double sPrev = 0.0;
            double cm = 1.0;
            double sm = 0.0;
            double qmm = 1.0 / Math.sqrt(4 * Math.PI);
            for (int m = 0; m <= nMax; m++) {
                if (m > 0) {
                    cPrev = cm;
                    sPrev = sm;
                    cm = cPrev * ex - sPrev * ey;
                    sm = sPrev * ex + cPrev * ey;
                    qmm *= Math.sqrt((2.0 * m + 1) / (2.0 * m)) * (m == 1 ? Math.sqrt(2.0) : 1.0);
                }
                // ∇W for W = C_m: m(C_{m−1}, −S_{m−1}, 0); for W = S_m: m(S_{m−1}, C_{m−1}, 0).
                double gcx = m * cPrev;
                double gcy = -m * sPrev;
                double gsx = m * sPrev;
                double gsy = m * cPrev;
                double q2 = 0.0;
                double d2 = 0.0;
                double q1 = qmm;
                double d1 = 0.0;
                for (int n = m; n <= nMax; n++) {
                    double qn;
                    double dn;
                    if (n == m) {
                        qn = qmm;
                        dn = 0.0;
                    } else if (n == m + 1) {
                        double a = Math.sqrt(2.0 * m + 3);
                        qn = a * ez * q1;
                        dn = a * q1;
                    } else {
                        double nn = n;
                        double a = Math.sqrt((4 * nn * nn - 1) / (nn * nn - (double) m * m));
                        double b = Math.sqrt((2 * nn + 1) * (nn - 1 - m) * (nn - 1 + m) / ((2 * nn - 3) * (nn * nn - (double) m * m)));
                        qn = a * ez * q1 - b * q2;
                        dn = a * (q1 + ez * d1) - b * d2;
                    }
                    if (n > m) {
                        q2 = q1;
                        d2 = d1;
                    }
                    q1 = qn;
                    d1 = dn;
                    if (n == 0) {
                        continue;
                    }
                    // Radial part of ∇(s^{n−m}Q̄(z/s)) at s = 1 and the tangential Q̄′ term.
                    double rad = (n - m) * qn - dn * ez;
                    double bx = rad * ex;
                    double by = rad * ey;
                    double bz = rad * ez + dn;
                    int base = n * n - 1;
                    if (m == 0) {
                        yv[base] = qn;
                        tv[3 * base] = bx;
                        tv[3 * base + 1] = by;
                        tv[3 * base + 2] = bz;
                    } else {
                        int ic = base + 2 * m - 1;
                        yv[ic] = qn * cm;
                        tv[3 * ic] = cm * bx + qn * gcx;
                        tv[3 * ic + 1] = cm * by + qn * gcy;
                        tv[3 * ic + 2] = cm * bz;
                        int is = base + 2 * m;
                        yv[is] = qn * sm;
                        tv[3 * is] = sm * bx + qn * gsx;
                        tv[3 * is + 1] = sm * by + qn * gsy;
                        tv[3 * is + 2] = sm * bz;
                    }
                }
            }
        }
    }
}
