package org.stillfield.analysis;

import java.util.HashMap;
import java.util.Map;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/**
 * Free-space transverse tensors for any isotropic spectral weight g(k), by quadrature:
 *
 * <pre>
 *   T_ij(d) = ∫_{k ≤ k_max} d³k/(2π)³ g(k) (δ_ij − k̂_i k̂_j) e^{ik·d}
 *           = T_⊥(r) δ_ij + (T_∥(r) − T_⊥(r)) d̂_i d̂_j,   r = |d|,
 *   T_∥(r) = (1/2π²) ∫ k² g(k) · 2 j₁(kr)/(kr) dk,
 *   T_⊥(r) = (1/2π²) ∫ k² g(k) · (j₀(kr) − j₁(kr)/(kr)) dk,
 * </pre>
 *
 * using the angular averages ∫dΩ/4π e^{ik·d} = j₀(kr) and ∫dΩ/4π k̂_ik̂_j e^{ik·d} =
 * δ_ij j₁(x)/x − d̂_id̂_j j₂(x), with j₂ = 3j₁/x − j₀ (derived, see REFERENCE-VALUES.md §5 for the
 * same integrals in closed form). This gives the free-space references for windows without a
 * closed form (the Gaussian and hard windows, thermal states) and the free-space kernels:
 *
 * <ul>
 *   <li>{@link #correlation}: g = W(ω)·coth(ħω/2k_BT)·Vσ²_vac(k), i.e. ħω/2ε for E, ħ/(2εω) for A,
 *       ħω/(2εc_m²) for B (PHYSICS.md §2, §4), up to the window's truncation k_max = ω_trunc/c_m, so
 *       the result is the V → ∞ limit of the mode sum over the same enumerated band;</li>
 *   <li>{@link #kernel}: g = ρ(k)/(W coth Vσ²_vac), the V → ∞ limit of the mode-space kernel
 *       Σ ρ_l f_l f_lᵀ/(V²σ_l²) of {@link ModeSpaceKernel} (PHYSICS.md §4).</li>
 * </ul>
 *
 * <p>Quadrature: 20-point Gauss–Legendre on panels no wider than π/r (half an oscillation) and
 * k_max/48; the spherical Bessel combinations use their power series below kr = 0.5 to avoid
 * cancellation. Values are memoised by r (lattices repeat separations). Thread-safe.
 */
public final class FreeSpaceSpectrum {
    private static final int MIN_PANELS = 48;
    private static final int MEMO_LIMIT = 200_000;
    private static final double[] NODES;
    private static final double[] WEIGHTS;

    static {
        GaussIntegrator gi = new GaussIntegratorFactory().legendre(20);
        NODES = new double[gi.getNumberOfPoints()];
        WEIGHTS = new double[gi.getNumberOfPoints()];
        for (int i = 0; i < NODES.length; i++) {
            NODES[i] = gi.getPoint(i);
            WEIGHTS[i] = gi.getWeight(i);
        }
    }

    private final DoubleUnaryOperator density;
    private final double kMax;
    private final String description;
    private final Map<Double, double[]> memo = new HashMap<>();

    private FreeSpaceSpectrum(DoubleUnaryOperator density, double kMax, String description) {
        this.density = density;
        this.kMax = kMax;
        this.description = description;
    }

    /**
     * @param density g(k), finite for 0 &lt; k ≤ kMax; k² g(k) must stay integrable at 0
     * @param kMax upper limit, rad/m, positive and finite
     * @param description what g is, for reports
     * @return the tensors of that weight
     */
    public static FreeSpaceSpectrum of(DoubleUnaryOperator density, double kMax, String description) {
        Objects.requireNonNull(density, "density");
        Objects.requireNonNull(description, "description");
        if (!(kMax > 0) || !Double.isFinite(kMax)) {
            throw new IllegalArgumentException("kMax must be positive and finite (rad/m): " + kMax);
        }
        return new FreeSpaceSpectrum(density, kMax, description);
    }

    /**
     * Free-space C^F with the run's window and state, over the band the mode table enumerates.
     *
     * @param field the field
     * @param window the spectral window
     * @param state vacuum or thermal
     * @param medium the filling
     * @return C^F_ij(d), (field unit)²
     */
    public static FreeSpaceSpectrum correlation(Field field, Window window, ThermalState state, Medium medium) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(state, "state");
        Objects.requireNonNull(medium, "medium");
        double c = medium.waveSpeed();
        return of(k -> window.weight(c * k) * state.varianceFactor(c * k) * vacuumDensity(field, medium, k),
            window.truncationOmega() / c, "free-space " + field + " correlation, " + window.kind() + " window");
    }

    /**
     * Free-space limit of the mode-space kernel Σ_l ρ(k_l) f_l f_lᵀ/(V²σ_l²) with the drawn
     * variances σ_l² = W·coth·σ²_vac, over the window's band.
     *
     * @param field the field (B uses the magnetic mode functions, the same operator as E)
     * @param window the window the variances were drawn with
     * @param state vacuum or thermal
     * @param medium the filling
     * @param regulator ρ(k), k in rad/m, finite
     * @return K^F_ij(d), 1/((field unit)²·m⁶)
     */
    public static FreeSpaceSpectrum kernel(Field field, Window window, ThermalState state, Medium medium,
                                           DoubleUnaryOperator regulator) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(state, "state");
        Objects.requireNonNull(medium, "medium");
        Objects.requireNonNull(regulator, "regulator");
        double c = medium.waveSpeed();
        return of(k -> {
            double w = window.weight(c * k);
            return w > 0 ? regulator.applyAsDouble(k) / (w * state.varianceFactor(c * k) * vacuumDensity(field, medium, k))
                : 0.0;
        }, window.truncationOmega() / c, "free-space " + field + " kernel, " + window.kind() + " window");
    }

    /** V σ²_vac as a function of k: ħω/2ε (E), ħ/(2εω) (A), ħω/(2εc_m²) (B); PHYSICS.md §2. */
    static double vacuumDensity(Field field, Medium medium, double k) {
        double c = medium.waveSpeed();
        double eps = medium.permittivity();
        double omega = c * k;
        switch (field) {
            case A:
                return PhysicalConstants.HBAR / (2 * eps * omega);
            case E:
                return PhysicalConstants.HBAR * omega / (2 * eps);
            default:
                return PhysicalConstants.HBAR * omega / (2 * eps * c * c);
        }
    }

    /** @return the upper limit k_max, rad/m */
    public double kMax() {
        return kMax;
    }

    /** @return what g is */
    public String description() {
        return description;
    }

    /**
     * @param r separation, metres, ≥ 0 and finite
     * @return {T_∥(r), T_⊥(r)}
     */
    public synchronized double[] components(double r) {
        if (!(r >= 0) || !Double.isFinite(r)) {
            throw new IllegalArgumentException("separation r must be finite and >= 0 (metres): " + r);
        }
        double[] v = memo.get(r);
        if (v == null) {
            v = integrate(r);
            if (memo.size() >= MEMO_LIMIT) {
                memo.clear();
            }
            memo.put(r, v);
        }
        return v.clone();
    }

    /** @return T_∥(r), the component along the separation */
    public double parallel(double r) {
        return components(r)[0];
    }

    /** @return T_⊥(r), the component across the separation */
    public double perpendicular(double r) {
        return components(r)[1];
    }

    /**
     * @param d separation r − r′, metres, finite
     * @return T_ij(d), [i][j]
     */
    public double[][] tensor(Vec3 d) {
        Objects.requireNonNull(d, "d");
        if (!d.isFinite()) {
            throw new IllegalArgumentException("separation must be finite: " + d);
        }
        double r = d.norm();
        double[] pp = components(r);
        double[] u = r > 0 ? new double[] {d.x() / r, d.y() / r, d.z() / r} : new double[3];
        double[][] t = new double[3][3];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                // At r = 0 the tensor is isotropic (T_∥ = T_⊥), so the direction does not matter.
                t[i][j] = (i == j ? pp[1] : 0.0) + (pp[0] - pp[1]) * u[i] * u[j];
            }
        }
        return t;
    }

    /**
     * The image term near the PEC plane x_n = w, T(r − Pr′)·S with S = +1 on the normal and −1 on
     * the tangential components for E and A, the opposite for B (PHYSICS.md §4; the same
     * construction as {@link AnalyticCorrelation#planeImage}).
     *
     * @param field selects the sign pattern
     * @param normalAxis n, 0..2
     * @param wallPosition w, metres
     * @param r first point, metres
     * @param r2 second point, metres, same side of the plane
     * @return the image term, [i][j]
     */
    public double[][] planeImage(Field field, int normalAxis, double wallPosition, Vec3 r, Vec3 r2) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(r, "r");
        Objects.requireNonNull(r2, "r2");
        if (normalAxis < 0 || normalAxis > 2) {
            throw new IllegalArgumentException("normalAxis must be 0, 1 or 2: " + normalAxis);
        }
        if (!Double.isFinite(wallPosition)) {
            throw new IllegalArgumentException("wallPosition must be finite: " + wallPosition);
        }
        if ((r.get(normalAxis) - wallPosition) * (r2.get(normalAxis) - wallPosition) < 0) {
            throw new IllegalArgumentException("points must lie on the same side of the plane: " + r + ", " + r2);
        }
        double[] p = {r2.x(), r2.y(), r2.z()};
        p[normalAxis] = 2 * wallPosition - p[normalAxis];
        double[][] t = tensor(r.minus(new Vec3(p[0], p[1], p[2])));
        double normalSign = field == Field.B ? -1.0 : 1.0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                t[i][j] *= j == normalAxis ? normalSign : -normalSign;
            }
        }
        return t;
    }

    /**
     * Free space plus the image of one PEC plane.
     *
     * @param field selects the sign pattern
     * @param normalAxis n, 0..2
     * @param wallPosition w, metres
     * @param r first point, metres
     * @param r2 second point, metres
     * @return T(r − r′) + T(r − Pr′)S, [i][j]
     */
    public double[][] nearPlane(Field field, int normalAxis, double wallPosition, Vec3 r, Vec3 r2) {
        double[][] img = planeImage(field, normalAxis, wallPosition, r, r2);
        double[][] t = tensor(r.minus(r2));
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                t[i][j] += img[i][j];
            }
        }
        return t;
    }

    private double[] integrate(double r) {
        int panels = MIN_PANELS;
        if (r > 0) {
            panels = (int) Math.max(MIN_PANELS, Math.ceil(kMax * r / Math.PI));
        }
        double h = kMax / panels;
        double par = 0;
        double perp = 0;
        for (int p = 0; p < panels; p++) {
            double mid = (p + 0.5) * h;
            double sPar = 0;
            double sPerp = 0;
            for (int i = 0; i < NODES.length; i++) {
                double k = mid + 0.5 * h * NODES[i];
                double g = density.applyAsDouble(k);
                if (g == 0) {
                    continue;
                }
                if (!Double.isFinite(g)) {
                    throw new IllegalArgumentException("spectral weight must be finite: g(" + k + ") = " + g);
                }
                double x = k * r;
                double w = WEIGHTS[i] * k * k * g;
                double j1x = j1OverX(x);
                sPar += w * 2 * j1x;
                sPerp += w * (j0(x) - j1x);
            }
            par += 0.5 * h * sPar;
            perp += 0.5 * h * sPerp;
        }
        double f = 1.0 / (2 * Math.PI * Math.PI);
        return new double[] {f * par, f * perp};
    }

    /** j₀(x) = sin x / x; series Σ (−1)^m x^{2m}/(2m+1)! below 0.5. */
    static double j0(double x) {
        if (x < 0.5) {
            double x2 = x * x;
            double term = 1;
            double sum = 1;
            for (int m = 1; m < 12; m++) {
                term *= -x2 / ((2.0 * m) * (2.0 * m + 1));
                sum += term;
            }
            return sum;
        }
        return Math.sin(x) / x;
    }

    /** j₁(x)/x = (sin x − x cos x)/x³; series Σ (−1)^m 2(m+1) x^{2m}/(2m+3)! below 0.5. */
    static double j1OverX(double x) {
        if (x < 0.5) {
            double x2 = x * x;
            double fact = 6; // (2m+3)! at m = 0
            double pow = 1;
            double sum = 0;
            for (int m = 0; m < 12; m++) {
                sum += (m % 2 == 0 ? 1 : -1) * 2.0 * (m + 1) * pow / fact;
                pow *= x2;
                fact *= (2.0 * m + 4) * (2.0 * m + 5);
            }
            return sum;
        }
        return (Math.sin(x) - x * Math.cos(x)) / (x * x * x);
    }
}
