package org.stillfield.analysis;

import java.util.List;
import java.util.Objects;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/**
 * Analytic references for the equal-time two-point tensors C^F_ij(r, r′) = ⟨F_i(r) F_j(r′)⟩ of
 * PHYSICS.md §4: the cavity mode sum, the free-space closed forms with the exponential window,
 * and the image formula near one perfectly conducting plane. Everything here is deterministic and
 * usable without sampling. Tensors are returned as fresh {@code double[3][3]}, [i][j] = C_ij, in
 * (field unit)².
 *
 * <p><b>Filling.</b> In a uniform lossless medium (ε_r, μ_r) every formula holds with ε0 → ε = ε0ε_r
 * and c → c_m = c/√(ε_rμ_r) (PHYSICS.md §1); then C^B = C^E / c_m², since μ = 1/(ε c_m²). The
 * window length is a = c_m/ω_c, because the exponential window e^{−ω/ω_c} = e^{−k c_m/ω_c}.
 *
 * <p><b>Free space</b> (REFERENCE-VALUES.md §5; derived there, the a → 0 E limit is the textbook
 * result, e.g. Milonni, The Quantum Vacuum, 1994, source from memory). With s = r² + a²:
 * <pre>
 *   C^E_ij(r) = (ħc_m/π²ε) [ δ_ij (a² − r²)/s³ + 2 x_i x_j / s³ ]
 *             (parallel ħc_m/(π²ε s²), perpendicular ħc_m(a² − r²)/(π²ε s³))
 *   C^A:  parallel      (ħ/4π²εc_m) · 2 g(r/a)/a²,
 *         perpendicular (ħ/4π²εc_m) · (1/s − g(r/a)/a²),   g(t) = (t − atan t)/t³
 * </pre>
 * The A form equals REFERENCE-VALUES.md's [1/s + 1/r² + a²/(s r²) − 2a atan(r/a)/r³] and
 * [1/s − 1/r² + a atan(r/a)/r³] after simplification; g is evaluated by its series
 * Σ (−1)ⁿ t²ⁿ/(2n+3) for t &lt; 0.5 to avoid cancellation, so C^A(0) = ħδ_ij/(6π²εc_m a²) exactly.
 * These are vacuum values (no thermal factor).
 *
 * <p><b>Near a plane</b> (method of images, PHYSICS.md §4): for a PEC plane z = 0 and points in
 * z ≥ 0, C(r, r′) = C0(r − r′) + C0(r − Pr′)·S with P(x,y,z) = (x,y,−z), S_E = diag(−1,−1,+1) and
 * S_B = diag(+1,+1,−1). A uses S_E: its mode functions are the electric ones, so the construction is
 * the same for any spectral weight. Any other wall is reached by a coordinate map: the wall
 * x_n = w (normal axis n) is the plane z = 0 after relabelling axis n as z and shifting by w, which
 * is what {@link #nearPlane(Field, int, double, Vec3, Vec3, double, Medium)} does directly: P
 * reflects component n about w, and S is +1 (E, A) or −1 (B) on n and the opposite sign on the two
 * tangential axes. The excess ⟨E²⟩ − ⟨E²⟩_free at distance z is (ħc_m/2π²ε)(6Z² − 2a²)/(Z² + a²)³,
 * Z = 2z, which tends to 3ħc_m/(16π²εz⁴) (REFERENCE-VALUES.md §6; Lütken &amp; Ravndal 1985, source from
 * memory).
 */
public final class AnalyticCorrelation {
    /** Below this r/a the A functions use their power series. */
    private static final double SERIES_BELOW = 0.5;
    /** Terms of the series: 0.25^40 is far below double precision. */
    private static final int SERIES_TERMS = 40;

    private AnalyticCorrelation() {
    }

    /**
     * Mode sum C^F_ij(r, r′) = Σ_l W_l·coth·σ²_vac,l u_l,i(r) u_l,j(r′) (h_l for B) with the table's
     * modes, window and state (PHYSICS.md §4). For many pairs use {@link ModeSumCorrelation}, which
     * evaluates each point's mode functions once.
     *
     * @param table the modes and variances
     * @param field the field
     * @param r first point, metres
     * @param r2 second point, metres
     * @return C_ij, (field unit)²
     */
    public static double[][] modeSum(ModeTable table, Field field, Vec3 r, Vec3 r2) {
        Objects.requireNonNull(field, "field");
        return ModeSumCorrelation.of(table, List.of(r, r2)).tensor(field, 0, 1);
    }

    /**
     * The exponential window's length a = c_m/ω_c.
     *
     * @param window an exponential window
     * @param medium the filling
     * @return a, metres
     * @throws IllegalArgumentException if the window is not exponential
     */
    public static double windowLength(Window window, Medium medium) {
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(medium, "medium");
        if (window.kind() != Window.Kind.EXP) {
            throw new IllegalArgumentException(
                "window.kind must be exp for the closed-form correlations (they assume W = exp(-w/wc)): " + window.kind());
        }
        return medium.waveSpeed() / window.omegaC();
    }

    /**
     * Free-space C^F_ij at separation r − r′ with the exponential window.
     *
     * @param field the field
     * @param separation r − r′, metres, finite
     * @param a window length c_m/ω_c, metres, positive and finite
     * @param medium the filling
     * @return C_ij, (field unit)²
     */
    public static double[][] freeSpace(Field field, Vec3 separation, double a, Medium medium) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(separation, "separation");
        Objects.requireNonNull(medium, "medium");
        checkLength(a);
        if (!separation.isFinite()) {
            throw new IllegalArgumentException("separation must be finite: " + separation);
        }
        double x = separation.x();
        double y = separation.y();
        double z = separation.z();
        double r2 = x * x + y * y + z * z;
        double perp;
        double outer; // coefficient of x_i x_j
        if (field == Field.A) {
            double pre = prefactorA(medium);
            double t = Math.sqrt(r2) / a;
            double a2 = a * a;
            double g = g(t);
            perp = pre * (1.0 / (r2 + a2) - g / a2);
            outer = pre * h(t) / (a2 * a2);
        } else {
            double pre = prefactorE(medium);
            if (field == Field.B) {
                double cm = medium.waveSpeed();
                pre /= cm * cm;
            }
            double s = r2 + a * a;
            double s3 = s * s * s;
            perp = pre * (a * a - r2) / s3;
            outer = pre * 2.0 / s3;
        }
        double[] v = {x, y, z};
        double[][] c = new double[3][3];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                c[i][j] = outer * v[i] * v[j] + (i == j ? perp : 0.0);
            }
        }
        return c;
    }

    /**
     * Free-space component along the separation, r̂·C·r̂.
     *
     * @param field the field
     * @param r separation length, metres, ≥ 0
     * @param a window length, metres
     * @param medium the filling
     * @return C_∥, (field unit)²
     */
    public static double freeSpaceParallel(Field field, double r, double a, Medium medium) {
        checkSeparation(r);
        return freeSpace(field, new Vec3(0, 0, r), a, medium)[2][2];
    }

    /**
     * Free-space component perpendicular to the separation.
     *
     * @param field the field
     * @param r separation length, metres, ≥ 0
     * @param a window length, metres
     * @param medium the filling
     * @return C_⊥, (field unit)²
     */
    public static double freeSpacePerpendicular(Field field, double r, double a, Medium medium) {
        checkSeparation(r);
        return freeSpace(field, new Vec3(0, 0, r), a, medium)[0][0];
    }

    /**
     * Image formula near the PEC plane z = 0; both points must lie in z ≥ 0.
     *
     * @param field the field
     * @param r first point, metres
     * @param r2 second point, metres
     * @param a window length, metres
     * @param medium the filling
     * @return C_ij(r, r′), (field unit)²
     */
    public static double[][] nearPlane(Field field, Vec3 r, Vec3 r2, double a, Medium medium) {
        return nearPlane(field, 2, 0.0, r, r2, a, medium);
    }

    /**
     * Image formula near the PEC plane x_n = w (n the normal axis). Both points must lie on the
     * same side of the plane (or on it); that side is the field's half-space.
     *
     * @param field the field
     * @param normalAxis n, 0 (x), 1 (y) or 2 (z)
     * @param wallPosition w, metres, finite
     * @param r first point, metres
     * @param r2 second point, metres
     * @param a window length, metres
     * @param medium the filling
     * @return C_ij(r, r′) = C0(r − r′)_ij + C0(r − Pr′)_ij S_jj, (field unit)²
     */
    public static double[][] nearPlane(Field field, int normalAxis, double wallPosition, Vec3 r, Vec3 r2, double a,
                                       Medium medium) {
        double[][] image = planeImage(field, normalAxis, wallPosition, r, r2, a, medium);
        double[][] direct = freeSpace(field, r.minus(r2), a, medium);
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                direct[i][j] += image[i][j];
            }
        }
        return direct;
    }

    /**
     * The image term alone, C0(r − Pr′)_ij S_jj: the plane's change of the free-space correlation.
     * Computing it separately avoids subtracting the large free-space value when only the excess
     * is wanted (at r = r′ the free part is ~1/a⁴, the excess ~1/z⁴).
     *
     * @param field the field
     * @param normalAxis n, 0 (x), 1 (y) or 2 (z)
     * @param wallPosition w, metres, finite
     * @param r first point, metres
     * @param r2 second point, metres (same side of the plane as r)
     * @param a window length, metres
     * @param medium the filling
     * @return the image term, (field unit)²
     */
    public static double[][] planeImage(Field field, int normalAxis, double wallPosition, Vec3 r, Vec3 r2, double a,
                                        Medium medium) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(r, "r");
        Objects.requireNonNull(r2, "r2");
        if (normalAxis < 0 || normalAxis > 2) {
            throw new IllegalArgumentException("normalAxis must be 0, 1 or 2: " + normalAxis);
        }
        if (!Double.isFinite(wallPosition)) {
            throw new IllegalArgumentException("wallPosition must be finite: " + wallPosition);
        }
        double side1 = r.get(normalAxis) - wallPosition;
        double side2 = r2.get(normalAxis) - wallPosition;
        if (side1 * side2 < 0) {
            throw new IllegalArgumentException(String.format(
                "points must lie on the same side of the plane x_%d = %g: %s and %s", normalAxis, wallPosition, r, r2));
        }
        double[] p = {r2.x(), r2.y(), r2.z()};
        p[normalAxis] = 2 * wallPosition - p[normalAxis];
        double[][] mirror = freeSpace(field, r.minus(new Vec3(p[0], p[1], p[2])), a, medium);
        double normalSign = field == Field.B ? -1.0 : 1.0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                mirror[i][j] *= j == normalAxis ? normalSign : -normalSign;
            }
        }
        return mirror;
    }

    /** ħ c_m / (π² ε), the E prefactor, V²/m² · m⁴. */
    static double prefactorE(Medium medium) {
        return PhysicalConstants.HBAR * medium.waveSpeed() / (Math.PI * Math.PI * medium.permittivity());
    }

    /** ħ / (4π² ε c_m), the A prefactor, (V·s/m)² · m². */
    static double prefactorA(Medium medium) {
        return PhysicalConstants.HBAR / (4 * Math.PI * Math.PI * medium.permittivity() * medium.waveSpeed());
    }

    /** g(t) = (t − atan t)/t³ = Σ (−1)ⁿ t²ⁿ/(2n+3). */
    static double g(double t) {
        if (t < SERIES_BELOW) {
            double t2 = t * t;
            double sum = 0;
            double p = 1;
            for (int n = 0; n < SERIES_TERMS; n++) {
                sum += p / (2 * n + 3);
                p *= -t2;
            }
            return sum;
        }
        return (t - Math.atan(t)) / (t * t * t);
    }

    /**
     * h(t) = (3g(t) − 1/(1+t²))/t², so that a⁴(C∥ − C⊥)/r² = pre·h for A; series
     * Σ (−1)ⁿ t²ⁿ (2n+2)/(2n+5) near 0.
     */
    static double h(double t) {
        if (t < SERIES_BELOW) {
            double t2 = t * t;
            double sum = 0;
            double p = 1;
            for (int n = 0; n < SERIES_TERMS; n++) {
                sum += p * (2.0 * n + 2) / (2 * n + 5);
                p *= -t2;
            }
            return sum;
        }
        return (3 * g(t) - 1 / (1 + t * t)) / (t * t);
    }

    private static void checkLength(double a) {
        if (!(a > 0) || !Double.isFinite(a)) {
            throw new IllegalArgumentException("window length a must be positive and finite (metres): " + a);
        }
    }

    private static void checkSeparation(double r) {
        if (!(r >= 0) || !Double.isFinite(r)) {
            throw new IllegalArgumentException("separation r must be finite and >= 0 (metres): " + r);
        }
    }
}
