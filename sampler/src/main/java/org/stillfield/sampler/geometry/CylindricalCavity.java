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
 * PEC circular cylinder ("pillbox") of radius R and length d (PHYSICS.md §1; resonances as in
 * Pozar, Microwave Engineering, circular cavity section, source from memory for the section).
 *
 * <p>Placement: the axis is the line x = y = R, so the cavity is x²+y² ≤ R² around (R, R) for
 * 0 ≤ z ≤ d and its bounding box is [0,2R]×[0,2R]×[0,d]. With X = x − R, Y = y − R, ρ, φ the
 * polar coordinates of (X, Y), β = pπ/d and ψ = J_n(γρ)·{cos nφ, sin nφ}:
 * <ul>
 *   <li>TM_nmp, p ≥ 0, γ = x_nm/R (x_nm the m-th zero of J_n):
 *       u = A[−(β/k) g sin βz, (γ/k) ψ cos βz], h = A cos βz (g_y, −g_x, 0);</li>
 *   <li>TE_nmp, p ≥ 1, γ = x′_nm/R (zeros of J_n′; x′_0m = x_1m, the engineering convention):
 *       u = A (g_y, −g_x, 0) sin βz, h = A[(β/k) g cos βz, (γ/k) ψ sin βz];</li>
 * </ul>
 * with k² = γ² + β² and g = ∇_tψ/γ written through J_n′ = (J_{n−1} − J_{n+1})/2 and
 * nJ_n/x = (J_{n−1} + J_{n+1})/2 (A&amp;S 9.1.27), which gives
 * g = ½[J_{n−1}(cos(n−1)φ, −sin(n−1)φ) − J_{n+1}(cos(n+1)φ, sin(n+1)φ)] for the cos orientation
 * and ½[J_{n−1}(sin(n−1)φ, cos(n−1)φ) − J_{n+1}(sin(n+1)φ, −cos(n+1)φ)] for the sin one: no
 * 1/ρ anywhere, so the axis needs no special case. h = (1/k)∇×u in both families.
 *
 * <p>Normalisation ∫u·u = V from ∫_0^R J_n(γρ)²ρdρ = (R²/2)[J_n′(γR)² + (1 − n²/(γR)²)J_n(γR)²]
 * (Lommel's integral, source from memory; verified by quadrature in the tests) and ∫|∇_tψ|² = γ²∫ψ² (Green's identity; the wall term vanishes for
 * both boundary conditions): A = √(V/(P d_p)) with P = ∫ψ² dA and d_p = d for p = 0, d/2 otherwise.
 *
 * <p>Labels: (family, n, m, p), orientation 0 = cos nφ, 1 = sin nφ (n ≥ 1 only).
 */
public final class CylindricalCavity implements Cavity {
    private final double radius;
    private final double length;
    private final Medium medium;

    private CylindricalCavity(double radius, double length, Medium medium) {
        this.radius = radius;
        this.length = length;
        this.medium = medium;
    }

    /**
     * @param radiusMetres radius R, positive and finite
     * @param lengthMetres length d along the axis, positive and finite
     * @param medium filling
     * @return the cavity
     */
    public static CylindricalCavity of(double radiusMetres, double lengthMetres, Medium medium) {
        Checks.positiveLength(radiusMetres, "cavity.radius_m");
        Checks.positiveLength(lengthMetres, "cavity.length_m");
        return new CylindricalCavity(radiusMetres, lengthMetres, Objects.requireNonNull(medium, "medium"));
    }

    @Override
    public String shape() {
        return "cylinder";
    }

    @Override
    public Map<String, Double> parameters() {
        Map<String, Double> p = new LinkedHashMap<>();
        p.put("radius_m", radius);
        p.put("length_m", length);
        return p;
    }

    @Override
    public Medium medium() {
        return medium;
    }

    @Override
    public double volume() {
        return Math.PI * radius * radius * length;
    }

    @Override
    public Vec3[] bounds() {
        return new Vec3[] {Vec3.ZERO, new Vec3(2 * radius, 2 * radius, length)};
    }

    /** Inside or on the wall; the radial test allows 1e-13 R so that wall points computed in floating point count. */
    @Override
    public boolean contains(Vec3 r) {
        if (!(r.z() >= 0 && r.z() <= length)) {
            return false;
        }
        return Math.hypot(r.x() - radius, r.y() - radius) <= radius * (1 + 1e-13);
    }

    /**
     * N(k) ≈ Vk³/(3π²) − (R/2 + 2d/(3π))k + 1/2, derived here: the cylinder's modes are disk
     * Dirichlet (TM, p ≥ 0) and Neumann
     * (TE, p ≥ 1, constant mode excluded) modes times axial ones; inserting the disk's smooth
     * counts Aγ²/(4π) ∓ Lγ/(4π) + 1/6 (Weyl plus the curvature constant, McKean &amp; Singer 1967,
     * source from memory) and the axial counts (d/π)q ± 1/2 gives these terms. The same
     * computation for a rectangle reproduces the box's −(a+b+d)k/(2π) + 1/2 exactly. The O(k)
     * terms read as the two rims' edge term −(4πR)k/(8π) (the box's coefficient per edge length)
     * and the side wall's curvature term −(k/(3π²))∫(κ1 + κ2) dS = −2dk/(3π). The residual bound
     * used in the tests is empirical.
     */
    @Override
    public double weylCount(double k) {
        double v = volume() * k * k * k / (3 * Math.PI * Math.PI) - (radius / 2 + 2 * length / (3 * Math.PI)) * k + 0.5;
        return Math.max(0.0, v);
    }

    @Override
    public double lowestK() {
        double x01 = BesselZeros.first(BesselZeros.Kind.J, 0, 1)[0];
        double xp11 = BesselZeros.first(BesselZeros.Kind.J_PRIME, 1, 1)[0];
        double tm010 = x01 / radius;
        double te111 = Math.hypot(xp11 / radius, Math.PI / length);
        return Math.min(tm010, te111);
    }

    @Override
    public List<Mode> modesUpTo(double kMax) {
        if (!(kMax > 0) || !Double.isFinite(kMax)) {
            throw new IllegalArgumentException("kMax must be positive and finite: " + kMax);
        }
        double xMax = kMax * radius;
        double k2Max = kMax * kMax;
        List<Mode> out = new ArrayList<>();
        for (int n = 0; ; n++) {
            double[] tm = BesselZeros.upTo(BesselZeros.Kind.J, n, xMax);
            double[] te = BesselZeros.upTo(BesselZeros.Kind.J_PRIME, n, xMax);
            if (n >= 1 && tm.length == 0 && te.length == 0) {
                // Both first zeros grow with n for n ≥ 1 (A&S 9.5.2), so no higher order has one.
                break;
            }
            addFamily(out, "TM", n, tm, 0, k2Max);
            addFamily(out, "TE", n, te, 1, k2Max);
        }
        out.sort(RectangularCavity.ORDER);
        return out;
    }

    private void addFamily(List<Mode> out, String family, int n, double[] zeros, int pMin, double k2Max) {
        int orientations = n == 0 ? 1 : 2;
        for (int m = 0; m < zeros.length; m++) {
            double gamma = zeros[m] / radius;
            for (int p = pMin; ; p++) {
                double beta = p * Math.PI / length;
                double k2 = gamma * gamma + beta * beta;
                if (k2 > k2Max) {
                    break;
                }
                double k = Math.sqrt(k2);
                for (int o = 0; o < orientations; o++) {
                    out.add(new Mode(family, n, m + 1, p, o, k));
                }
            }
        }
    }

    @Override
    public ModeFunctions modeFunctions(List<Mode> modes) {
        return new CylinderModeFunctions(modes);
    }

    /**
     * Per mode: its radial entry (distinct (family, n, m)), axial index, orientation and the
     * constants A, β/k, γ/k. Per point: one Miller recurrence per radial entry, cos/sin of qφ for
     * q ≤ n_max + 1 and sin/cos of pπz/d for p ≤ p_max, then a few multiplications per mode.
     */
    private final class CylinderModeFunctions implements ModeFunctions {
        private final int count;
        private final int[] radialOf;
        private final int[] axial;
        private final boolean[] sine;
        private final boolean[] tm;
        private final double[] amp;
        private final double[] betaOverK;
        private final double[] gammaOverK;
        private final int[] radialOrder;
        private final double[] radialGamma;
        private final int nMax;
        private final int pMax;

        CylinderModeFunctions(List<Mode> modes) {
            count = modes.size();
            radialOf = new int[count];
            axial = new int[count];
            sine = new boolean[count];
            tm = new boolean[count];
            amp = new double[count];
            betaOverK = new double[count];
            gammaOverK = new double[count];
            // Zeros needed per (family, n): the largest radial index m.
            Map<Long, Integer> needed = new HashMap<>();
            for (Mode mode : modes) {
                boolean isTm = Checks.isTm(mode, "cylinder");
                if (mode.i1() < 0 || mode.i2() < 1 || mode.i3() < (isTm ? 0 : 1)
                    || mode.orientation() < 0 || mode.orientation() > (mode.i1() == 0 ? 0 : 1)) {
                    throw new IllegalArgumentException("not a cylinder mode: " + mode.label());
                }
                needed.merge(Checks.radialKey(isTm, mode.i1()), mode.i2(), Math::max);
            }
            Map<Long, double[]> zeros = new HashMap<>();
            for (Map.Entry<Long, Integer> e : needed.entrySet()) {
                boolean isTm = (e.getKey() & 1L) == 1L;
                int n = (int) (e.getKey() >> 1);
                zeros.put(e.getKey(), BesselZeros.first(isTm ? BesselZeros.Kind.J : BesselZeros.Kind.J_PRIME, n, e.getValue()));
            }
            Map<Long, Integer> radialIndex = new HashMap<>();
            List<Integer> orders = new ArrayList<>();
            List<Double> gammas = new ArrayList<>();
            List<Double> areas = new ArrayList<>();
            int nm = 0;
            int pm = 0;
            double v = volume();
            for (int q = 0; q < count; q++) {
                Mode mode = modes.get(q);
                boolean isTm = Checks.isTm(mode, "cylinder");
                int n = mode.i1();
                int m = mode.i2();
                int p = mode.i3();
                double x = zeros.get(Checks.radialKey(isTm, n))[m - 1];
                double gamma = x / radius;
                long rk = (Checks.radialKey(isTm, n) << 20) | m;
                Integer r = radialIndex.get(rk);
                if (r == null) {
                    r = orders.size();
                    radialIndex.put(rk, r);
                    orders.add(n);
                    gammas.add(gamma);
                    double[] t = new double[3];
                    BesselFunctions.cylinder(n, x, t);
                    double angular = n == 0 ? 2 * Math.PI : Math.PI;
                    double radialIntegral = isTm
                        ? 0.5 * radius * radius * t[2] * t[2]
                        : 0.5 * radius * radius * (1 - (double) n * n / (x * x)) * t[1] * t[1];
                    areas.add(angular * radialIntegral);
                }
                double beta = p * Math.PI / length;
                double k = Math.sqrt(gamma * gamma + beta * beta);
                double area = areas.get(r);
                double axialLength = p == 0 ? length : 0.5 * length;
                radialOf[q] = r;
                axial[q] = p;
                sine[q] = mode.orientation() == 1;
                tm[q] = isTm;
                amp[q] = Math.sqrt(v / (area * axialLength));
                betaOverK[q] = beta / k;
                gammaOverK[q] = gamma / k;
                nm = Math.max(nm, n);
                pm = Math.max(pm, p);
            }
            radialOrder = new int[orders.size()];
            radialGamma = new double[orders.size()];
            for (int r = 0; r < radialOrder.length; r++) {
                radialOrder[r] = orders.get(r);
                radialGamma[r] = gammas.get(r);
            }
            nMax = nm;
            pMax = pm;
        }


        @Override
        public int modeCount() {
            return count;
        }

        @Override
        public void evaluate(double x, double y, double z, double[] u, double[] h) {
            double dx = x - radius;
            double dy = y - radius;
            double rho = Math.hypot(dx, dy);
            // On the axis φ is arbitrary: every term carrying cos/sin(qφ) with q ≠ 0 has J_q(0) = 0.
            double phi = rho > 0 ? Math.atan2(dy, dx) : 0.0;
            // cq[q + 1] = cos(qφ), q = −1 … n_max + 1.
            double[] cq = new double[nMax + 3];
            double[] sq = new double[nMax + 3];
            for (int q = -1; q <= nMax + 1; q++) {
                cq[q + 1] = Math.cos(q * phi);
                sq[q + 1] = Math.sin(q * phi);
            }
            double[] cz = new double[pMax + 1];
            double[] sz = new double[pMax + 1];
            for (int p = 0; p <= pMax; p++) {
                cz[p] = Math.cos(p * Math.PI * z / length);
                sz[p] = Math.sin(p * Math.PI * z / length);
            }
            int nr = radialOrder.length;
            double[] jm = new double[nr];
            double[] j0 = new double[nr];
            double[] jp = new double[nr];
            double[] t = new double[3];
            for (int r = 0; r < nr; r++) {
                BesselFunctions.cylinder(radialOrder[r], radialGamma[r] * rho, t);
                jm[r] = t[0];
                j0[r] = t[1];
                jp[r] = t[2];
            }
            for (int q = 0; q < count; q++) {
                int r = radialOf[q];
                int n = radialOrder[r];
                double gx;
                double gy;
                double psi;
                if (sine[q]) {
                    gx = 0.5 * (jm[r] * sq[n] - jp[r] * sq[n + 2]);
                    gy = 0.5 * (jm[r] * cq[n] + jp[r] * cq[n + 2]);
                    psi = j0[r] * sq[n + 1];
                } else {
                    gx = 0.5 * (jm[r] * cq[n] - jp[r] * cq[n + 2]);
                    gy = 0.5 * (-jm[r] * sq[n] - jp[r] * sq[n + 2]);
                    psi = j0[r] * cq[n + 1];
                }
                int p = axial[q];
                double a = amp[q];
                int j = 3 * q;
                if (tm[q]) {
                    if (u != null) {
                        double s = -a * betaOverK[q] * sz[p];
                        u[j] = s * gx;
                        u[j + 1] = s * gy;
                        u[j + 2] = a * gammaOverK[q] * psi * cz[p];
                    }
                    if (h != null) {
                        double c = a * cz[p];
                        h[j] = c * gy;
                        h[j + 1] = -c * gx;
                        h[j + 2] = 0.0;
                    }
                } else {
                    if (u != null) {
                        double s = a * sz[p];
                        u[j] = s * gy;
                        u[j + 1] = -s * gx;
                        u[j + 2] = 0.0;
                    }
                    if (h != null) {
                        double c = a * betaOverK[q] * cz[p];
                        h[j] = c * gx;
                        h[j + 1] = c * gy;
                        h[j + 2] = a * gammaOverK[q] * psi * sz[p];
                    }
                }
            }
        }
    }
}
