package org.stillfield.sampler.geometry;

import java.util.ArrayList;
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
 * Periodic box (a 3-torus) with periods L_x, L_y, L_z, represented on [0,L_x]×[0,L_y]×[0,L_z].
 * It has no walls: it stands for a unit cell of free space, so mode sums here equal periodic image
 * sums of the free-space correlations.
 *
 * <p>Real plane waves: k = 2π(n_x/L_x, n_y/L_y, n_z/L_z) ≠ 0, each ±k pair taken once by the
 * half-space rule n_x &gt; 0, or n_x = 0 and n_y &gt; 0, or n_x = n_y = 0 and n_z &gt; 0. Per k four modes:
 * <pre>
 *   cos: u = √2 e_a cos(k·r),  h = −√2 (k̂ × e_a) sin(k·r)
 *   sin: u = √2 e_a sin(k·r),  h = +√2 (k̂ × e_a) cos(k·r)
 * </pre>
 * with e_1 = ẑ×k̂/|ẑ×k̂| (x̂ when k ∥ ẑ) and e_2 = k̂ × e_1, so {k̂, e_1, e_2} is right-handed and
 * h = (1/k)∇×u. The √2 makes ∫u·u = V; the cos/sin pair of one k spans the same space as
 * e^{±ik·r}, so the set is orthonormal and complete on transverse periodic fields.
 *
 * <p>Labels: family "COS" or "SIN", indices (n_x, n_y, n_z) (signed), orientation = polarisation 0 or 1.
 */
public final class PeriodicBox implements Cavity {
    private final double lx;
    private final double ly;
    private final double lz;
    private final Medium medium;

    private PeriodicBox(double lx, double ly, double lz, Medium medium) {
        this.lx = lx;
        this.ly = ly;
        this.lz = lz;
        this.medium = medium;
    }

    /**
     * @param lxMetres period along x, positive and finite
     * @param lyMetres period along y, positive and finite
     * @param lzMetres period along z, positive and finite
     * @param medium filling
     * @return the box
     */
    public static PeriodicBox of(double lxMetres, double lyMetres, double lzMetres, Medium medium) {
        Checks.positiveLength(lxMetres, "cavity.lx_m");
        Checks.positiveLength(lyMetres, "cavity.ly_m");
        Checks.positiveLength(lzMetres, "cavity.lz_m");
        return new PeriodicBox(lxMetres, lyMetres, lzMetres, Objects.requireNonNull(medium, "medium"));
    }

    @Override
    public String shape() {
        return "periodic";
    }

    @Override
    public Map<String, Double> parameters() {
        Map<String, Double> p = new LinkedHashMap<>();
        p.put("lx_m", lx);
        p.put("ly_m", ly);
        p.put("lz_m", lz);
        return p;
    }

    @Override
    public Medium medium() {
        return medium;
    }

    @Override
    public double volume() {
        return lx * ly * lz;
    }

    @Override
    public Vec3[] bounds() {
        return new Vec3[] {Vec3.ZERO, new Vec3(lx, ly, lz)};
    }

    @Override
    public boolean contains(Vec3 r) {
        return r.x() >= 0 && r.x() <= lx && r.y() >= 0 && r.y() <= ly && r.z() >= 0 && r.z() <= lz;
    }

    /**
     * Vk³/(3π²) − 2: the modes are two polarisations per reciprocal-lattice point 0 &lt; |k| ≤ k, the
     * lattice has one point per (2π)³/V, and the excluded k = 0 takes away two. No wall terms.
     */
    @Override
    public double weylCount(double k) {
        return Math.max(0.0, volume() * k * k * k / (3 * Math.PI * Math.PI) - 2.0);
    }

    @Override
    public double lowestK() {
        return 2 * Math.PI / Math.max(lx, Math.max(ly, lz));
    }

    @Override
    public List<Mode> modesUpTo(double kMax) {
        if (!(kMax > 0) || !Double.isFinite(kMax)) {
            throw new IllegalArgumentException("kMax must be positive and finite: " + kMax);
        }
        int nxMax = (int) Math.floor(kMax * lx / (2 * Math.PI));
        int nyMax = (int) Math.floor(kMax * ly / (2 * Math.PI));
        int nzMax = (int) Math.floor(kMax * lz / (2 * Math.PI));
        double k2Max = kMax * kMax;
        List<Mode> out = new ArrayList<>();
        for (int nx = 0; nx <= nxMax; nx++) {
            double kx = 2 * Math.PI * nx / lx;
            for (int ny = nx == 0 ? 0 : -nyMax; ny <= nyMax; ny++) {
                double ky = 2 * Math.PI * ny / ly;
                for (int nz = -nzMax; nz <= nzMax; nz++) {
                    if (!inHalfSpace(nx, ny, nz)) {
                        continue;
                    }
                    double kz = 2 * Math.PI * nz / lz;
                    double k2 = kx * kx + ky * ky + kz * kz;
                    if (k2 > k2Max) {
                        continue;
                    }
                    double k = Math.sqrt(k2);
                    for (int pol = 0; pol < 2; pol++) {
                        out.add(new Mode("COS", nx, ny, nz, pol, k));
                        out.add(new Mode("SIN", nx, ny, nz, pol, k));
                    }
                }
            }
        }
        out.sort(RectangularCavity.ORDER);
        return out;
    }

    private static boolean inHalfSpace(int nx, int ny, int nz) {
        return nx > 0 || (nx == 0 && (ny > 0 || (ny == 0 && nz > 0)));
    }

    @Override
    public ModeFunctions modeFunctions(List<Mode> modes) {
        return new PlaneWaves(modes);
    }

    /** Precomputes k, √2·e and √2·(k̂×e) per mode; a point costs one sin/cos pair per mode. */
    private final class PlaneWaves implements ModeFunctions {
        private final int count;
        private final double[] kv;
        private final double[] ue;
        private final double[] he;
        private final boolean[] sine;

        PlaneWaves(List<Mode> modes) {
            count = modes.size();
            kv = new double[3 * count];
            ue = new double[3 * count];
            he = new double[3 * count];
            sine = new boolean[count];
            double root2 = Math.sqrt(2.0);
            for (int q = 0; q < count; q++) {
                Mode mode = modes.get(q);
                boolean isSin = "SIN".equals(mode.family());
                if (!isSin && !"COS".equals(mode.family())) {
                    throw new IllegalArgumentException("not a periodic-box mode (family must be COS or SIN): " + mode.label());
                }
                if (!inHalfSpace(mode.i1(), mode.i2(), mode.i3()) || mode.orientation() < 0 || mode.orientation() > 1) {
                    throw new IllegalArgumentException("not a periodic-box mode: " + mode.label());
                }
                double kx = 2 * Math.PI * mode.i1() / lx;
                double ky = 2 * Math.PI * mode.i2() / ly;
                double kz = 2 * Math.PI * mode.i3() / lz;
                double k = Math.sqrt(kx * kx + ky * ky + kz * kz);
                double nx = kx / k;
                double ny = ky / k;
                double nz = kz / k;
                // e1 = ẑ × k̂ / |ẑ × k̂| = (−k̂_y, k̂_x, 0)/k̂_ρ, or x̂ on the z axis.
                double rho = Math.hypot(nx, ny);
                double e1x = rho > 0 ? -ny / rho : 1.0;
                double e1y = rho > 0 ? nx / rho : 0.0;
                double e1z = 0.0;
                // e2 = k̂ × e1
                double e2x = ny * e1z - nz * e1y;
                double e2y = nz * e1x - nx * e1z;
                double e2z = nx * e1y - ny * e1x;
                double ex = mode.orientation() == 0 ? e1x : e2x;
                double ey = mode.orientation() == 0 ? e1y : e2y;
                double ez = mode.orientation() == 0 ? e1z : e2z;
                // k̂ × e1 = e2, k̂ × e2 = −e1
                double bx = mode.orientation() == 0 ? e2x : -e1x;
                double by = mode.orientation() == 0 ? e2y : -e1y;
                double bz = mode.orientation() == 0 ? e2z : -e1z;
                double hs = isSin ? root2 : -root2;
                int j = 3 * q;
                kv[j] = kx;
                kv[j + 1] = ky;
                kv[j + 2] = kz;
                ue[j] = root2 * ex;
                ue[j + 1] = root2 * ey;
                ue[j + 2] = root2 * ez;
                he[j] = hs * bx;
                he[j + 1] = hs * by;
                he[j + 2] = hs * bz;
                sine[q] = isSin;
            }
        }

        @Override
        public int modeCount() {
            return count;
        }

        @Override
        public void evaluate(double x, double y, double z, double[] u, double[] h) {
            for (int q = 0; q < count; q++) {
                int j = 3 * q;
                double phase = kv[j] * x + kv[j + 1] * y + kv[j + 2] * z;
                double c = Math.cos(phase);
                double s = Math.sin(phase);
                // u carries cos for COS, sin for SIN; h the other one (signs folded into he).
                double fu = sine[q] ? s : c;
                double fh = sine[q] ? c : s;
                if (u != null) {
                    u[j] = ue[j] * fu;
                    u[j + 1] = ue[j + 1] * fu;
                    u[j + 2] = ue[j + 2] * fu;
                }
                if (h != null) {
                    h[j] = he[j] * fh;
                    h[j + 1] = he[j + 1] * fh;
                    h[j + 2] = he[j + 2] * fh;
                }
            }
        }
    }
}
