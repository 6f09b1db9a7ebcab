package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.stillfield.analysis.api.KernelPoint;
import org.stillfield.analysis.api.PowerLawFit;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;

/**
 * The kernel of the sampled density in the mode subspace (PHYSICS.md §4): with the drawn variances
 * σ_l² (window and thermal factor included) and a regulator ρ_l = ρ(k_l),
 *
 * <pre>
 *   K^ρ_ij(r, r′) = Σ_l ρ_l f_l,i(r) f_l,j(r′) / (V² σ_l²),     f = u (A, E), h (B).
 * </pre>
 *
 * With ρ ≡ 1 this is the inverse of the covariance on the sampled subspace: p[F] ∝
 * exp(−½∫∫ F K F). Its free-space limits are K_E = (2ε/ħc) r̂r̂/(π²r²) and K_A = (2εc/ħ)·2(2r̂r̂ −
 * δ)/(π²r⁴) (REFERENCE-VALUES.md pitfall 3), K_B = (2/μħc) r̂r̂/(π²r²). A finite mode set makes the
 * bare kernel oscillate (a hard cutoff k_c leaves K_E,∥ ∝ (1 − j₀(k_c r))/r² and K_A dominated by
 * k_c sin(k_c r)/r³), so comparisons use a smooth regulator, e.g. ρ = e^{−(kb)²}, whose free-space
 * effect is computed exactly by {@link FreeSpaceSpectrum#kernel}.
 *
 * <p><b>From samples.</b> The ensemble enters only through the per-mode variance estimates
 * σ̂_l² = (1/N)Σ_s a_l² (known zero mean; a = e for E, q for A and B): K̂ = Σ_l ρ_l f f
 * ((N−2)/N)/(V²σ̂_l²). Since Nσ̂²/σ² is χ²_N, E[1/χ²_N] = 1/(N−2) and Var[1/χ²_N] = 2/((N−2)²(N−4))
 * (inverse-χ² moments, standard; source from memory), so the factor (N−2)/N removes the bias and each
 * mode's relative factor ξ_l = ((N−2)/N)σ_l²/σ̂_l² has mean 1 and variance 2/(N−4), independently
 * across modes (the amplitudes are). The standard error of K̂ follows exactly:
 * Var K̂ = Σ_l (ρ_l f f/(V²σ_l²))² · 2/(N−4).
 *
 * <p>This is the mode-space route. On a point set the same kernel is the pseudo-inverse of the
 * point covariance when the points form an exact quadrature for the modes ({@link PointSetKernel}).
 */
public final class ModeSpaceKernel {
    /** What the fit compares. */
    public enum Component {
        /** K_∥ = n̂ᵀKn̂. */
        PARALLEL,
        /** K_∥ − K_⊥, the traceless part along n̂; insensitive to an isotropic offset such as the missing k = 0 of a periodic box. */
        ANISOTROPIC
    }

    private final ModeTable table;
    private final Field field;
    private final DoubleUnaryOperator regulator;
    private final String regulatorText;
    private final double[] exact;

    private ModeSpaceKernel(ModeTable table, Field field, DoubleUnaryOperator regulator, String regulatorText,
                            double[] exact) {
        this.table = table;
        this.field = field;
        this.regulator = regulator;
        this.regulatorText = regulatorText;
        this.exact = exact;
    }

    /**
     * @param table the modes and drawn variances
     * @param field the field
     * @param regulator ρ(k), k in rad/m, finite
     * @param regulatorText ρ in words, for reports
     * @return the kernel
     */
    public static ModeSpaceKernel of(ModeTable table, Field field, DoubleUnaryOperator regulator, String regulatorText) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(regulator, "regulator");
        Objects.requireNonNull(regulatorText, "regulatorText");
        double v = table.cavity().volume();
        double[] w = new double[table.size()];
        for (int l = 0; l < w.length; l++) {
            double rho = regulator.applyAsDouble(table.modes().get(l).k());
            if (!Double.isFinite(rho)) {
                throw new IllegalArgumentException("regulator must be finite: rho(" + table.modes().get(l).k() + ") = " + rho);
            }
            w[l] = rho / (v * v * table.variance(field, l));
        }
        return new ModeSpaceKernel(table, field, regulator, regulatorText, w);
    }

    /**
     * @param b regulator length, metres, positive
     * @return ρ(k) = exp(−(kb)²)
     */
    public static DoubleUnaryOperator gaussian(double b) {
        if (!(b > 0) || !Double.isFinite(b)) {
            throw new IllegalArgumentException("regulator length b must be positive and finite (metres): " + b);
        }
        return k -> Math.exp(-(k * b) * (k * b));
    }

    /** @return the field */
    public Field field() {
        return field;
    }

    /** @return the regulator in words */
    public String regulatorText() {
        return regulatorText;
    }

    /** @return a copy of the exact weights ρ_l/(V²σ_l²) */
    public double[] exactWeights() {
        return exact.clone();
    }

    /**
     * Bias-corrected weights from sampled variances, ρ_l ((n−2)/n)/(V²σ̂_l²).
     *
     * @param variances the ensemble's per-mode sums (same table)
     * @param leaveOut a jackknife group to leave out, or −1 for all samples
     * @return the weights
     */
    public double[] sampledWeights(ModeVariances variances, int leaveOut) {
        Objects.requireNonNull(variances, "variances");
        if (variances.modes() != exact.length) {
            throw new IllegalArgumentException("variances must cover the table's " + exact.length + " modes: "
                + variances.modes());
        }
        double[] ratio = variances.ratios(table, field, leaveOut);
        double n = ratio[exact.length];
        if (!(n > 4)) {
            throw new IllegalStateException("needs more than 4 samples for the kernel estimate: " + n);
        }
        double[] w = new double[exact.length];
        for (int l = 0; l < w.length; l++) {
            w[l] = exact[l] * ((n - 2) / n) / ratio[l];
        }
        return w;
    }

    /**
     * Σ_l w_l f_l,i(r) f_l,j(r′).
     *
     * @param weights per mode
     * @param r first point, metres
     * @param r2 second point, metres
     * @return the tensor, [i][j]
     */
    public double[][] tensor(double[] weights, Vec3 r, Vec3 r2) {
        int m = exact.length;
        ModeFunctions mf = table.cavity().modeFunctions(table.modes());
        double[] a = new double[3 * m];
        double[] b = new double[3 * m];
        eval(mf, r, a);
        eval(mf, r2, b);
        double[][] t = new double[3][3];
        for (int l = 0; l < m; l++) {
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    t[i][j] += weights[l] * a[3 * l + i] * b[3 * l + j];
                }
            }
        }
        return t;
    }

    private void eval(ModeFunctions mf, Vec3 r, double[] out) {
        if (field == Field.B) {
            mf.evaluate(r.x(), r.y(), r.z(), null, out);
        } else {
            mf.evaluate(r.x(), r.y(), r.z(), out, null);
        }
    }

    /**
     * The free-space kernel without regulator at separation r: {∥, ⊥}.
     *
     * @param field the field
     * @param medium the filling
     * @param r separation, metres, positive
     * @return {K_∥, K_⊥}, 1/((field unit)²·m⁶)
     */
    public static double[] ideal(Field field, Medium medium, double r) {
        double eps = medium.permittivity();
        double c = medium.waveSpeed();
        double hbar = PhysicalConstants.HBAR;
        double pi2 = Math.PI * Math.PI;
        switch (field) {
            case A: {
                double v = (2 * eps * c / hbar) * 2 / (pi2 * r * r * r * r);
                return new double[] {v, -v};
            }
            case E:
                return new double[] {(2 * eps / (hbar * c)) / (pi2 * r * r), 0.0};
            default:
                return new double[] {(2 / (medium.permeability() * hbar * c)) / (pi2 * r * r), 0.0};
        }
    }

    /**
     * Prepares the fall-off K(r) along given directions from given origins: for each separation,
     * the per-mode products (n̂·f_l(r₀))(n̂·f_l(r₀ + r n̂)) and f_l(r₀)·f_l(r₀ + r n̂) averaged over
     * origins and directions, so that any weight vector (exact, sampled, jackknife) gives K(r) by
     * one dot product. Memory 2·M·(separations) doubles.
     *
     * @param origins r₀, metres, inside the cavity
     * @param directions n̂ (normalised here), non-zero
     * @param separations r, metres, positive, increasing; every r₀ + r n̂ must lie inside the cavity
     * @return the prepared fall-off
     */
    public FallOff fallOff(List<Vec3> origins, List<Vec3> directions, double[] separations) {
        Objects.requireNonNull(origins, "origins");
        Objects.requireNonNull(directions, "directions");
        Objects.requireNonNull(separations, "separations");
        if (origins.isEmpty() || directions.isEmpty() || separations.length < 2) {
            throw new IllegalArgumentException("fallOff needs at least one origin, one direction and two separations");
        }
        for (int k = 0; k < separations.length; k++) {
            if (!(separations[k] > 0) || !Double.isFinite(separations[k]) || (k > 0 && !(separations[k] > separations[k - 1]))) {
                throw new IllegalArgumentException("separations must be positive, finite and increasing: "
                    + java.util.Arrays.toString(separations));
            }
        }
        int m = exact.length;
        int ns = separations.length;
        double[][] pPar = new double[ns][m];
        double[][] pTr = new double[ns][m];
        ModeFunctions mf = table.cavity().modeFunctions(table.modes());
        double[] a = new double[3 * m];
        double[] b = new double[3 * m];
        int count = origins.size() * directions.size();
        for (Vec3 o : origins) {
            if (!o.isFinite() || !table.cavity().contains(o)) {
                throw new IllegalArgumentException("origins must lie inside the cavity: " + o);
            }
            eval(mf, o, a);
            for (Vec3 d : directions) {
                double len = d.norm();
                if (!(len > 0) || !Double.isFinite(len)) {
                    throw new IllegalArgumentException("directions must be non-zero and finite: " + d);
                }
                double[] n = {d.x() / len, d.y() / len, d.z() / len};
                for (int k = 0; k < ns; k++) {
                    Vec3 p = o.plusScaled(new Vec3(n[0], n[1], n[2]), separations[k]);
                    if (!table.cavity().contains(p)) {
                        throw new IllegalArgumentException(String.format(Locale.ROOT,
                            "separation %.6g m from %s along %s leaves the cavity", separations[k], o, d));
                    }
                    eval(mf, p, b);
                    double[] par = pPar[k];
                    double[] tr = pTr[k];
                    for (int l = 0; l < m; l++) {
                        int i = 3 * l;
                        double na = n[0] * a[i] + n[1] * a[i + 1] + n[2] * a[i + 2];
                        double nb = n[0] * b[i] + n[1] * b[i + 1] + n[2] * b[i + 2];
                        par[l] += na * nb / count;
                        tr[l] += (a[i] * b[i] + a[i + 1] * b[i + 1] + a[i + 2] * b[i + 2]) / count;
                    }
                }
            }
        }
        return new FallOff(separations.clone(), pPar, pTr);
    }

    /** The kernel along a set of separations, for exact, sampled and jackknife weights. */
    public final class FallOff {
        private final double[] separations;
        private final double[][] pPar;
        private final double[][] pTr;
        private FreeSpaceSpectrum free;

        private FallOff(double[] separations, double[][] pPar, double[][] pTr) {
            this.separations = separations;
            this.pPar = pPar;
            this.pTr = pTr;
        }

        /** @return a copy of the separations, metres */
        public double[] separations() {
            return separations.clone();
        }

        /** @return {K_∥[k], K_⊥[k]} for the weights */
        public double[][] evaluate(double[] weights) {
            int ns = separations.length;
            double[][] out = new double[2][ns];
            for (int k = 0; k < ns; k++) {
                double par = 0;
                double tr = 0;
                for (int l = 0; l < weights.length; l++) {
                    par += weights[l] * pPar[k][l];
                    tr += weights[l] * pTr[k][l];
                }
                out[0][k] = par;
                out[1][k] = 0.5 * (tr - par);
            }
            return out;
        }

        /**
         * @return standard errors {∥[k], ⊥[k], (∥ − ⊥)[k]} of the sampled estimate from N samples
         *     (exact for Gaussian amplitudes, see class notes)
         */
        public double[][] standardErrors(long n) {
            if (n <= 4) {
                throw new IllegalArgumentException("n must exceed 4: " + n);
            }
            int ns = separations.length;
            double[][] out = new double[3][ns];
            double f = 2.0 / (n - 4);
            for (int k = 0; k < ns; k++) {
                double vp = 0;
                double vq = 0;
                double vd = 0;
                for (int l = 0; l < exact.length; l++) {
                    double par = exact[l] * pPar[k][l];
                    double perp = 0.5 * exact[l] * (pTr[k][l] - pPar[k][l]);
                    vp += par * par;
                    vq += perp * perp;
                    vd += (par - perp) * (par - perp);
                }
                out[0][k] = Math.sqrt(f * vp);
                out[1][k] = Math.sqrt(f * vq);
                out[2][k] = Math.sqrt(f * vd);
            }
            return out;
        }

        /** The free-space kernel with the same regulator and band (computed once). */
        public synchronized FreeSpaceSpectrum freeSpace() {
            if (free == null) {
                free = FreeSpaceSpectrum.kernel(field, table.window(), table.state(), table.cavity().medium(), regulator);
            }
            return free;
        }

        /**
         * @param variances the ensemble's per-mode sums, or null for mode-sum values only
         *     (sampled = mode sum, errors 0)
         * @return one point per separation
         */
        public List<KernelPoint> points(ModeVariances variances) {
            double[][] ms = evaluate(exact);
            double[][] est = variances == null ? ms : evaluate(sampledWeights(variances, -1));
            double[][] se = variances == null ? new double[3][separations.length] : standardErrors(variances.samples());
            FreeSpaceSpectrum fs = freeSpace();
            Medium medium = table.cavity().medium();
            List<KernelPoint> out = new ArrayList<>();
            for (int k = 0; k < separations.length; k++) {
                double r = separations[k];
                double[] f = fs.components(r);
                double[] id = ideal(field, medium, r);
                out.add(new KernelPoint(field, r, est[0][k], se[0][k], est[1][k], se[1][k], ms[0][k], ms[1][k], f[0], f[1],
                    id[0], id[1]));
            }
            return out;
        }

        /**
         * Fits K ≈ A r^p over [rMin, rMax] to the sampled kernel, with a delete-one-group jackknife
         * error over the ensemble's groups.
         *
         * @param variances the ensemble's per-mode sums
         * @param component what to fit
         * @param divideRegulator divide by the regulator's free-space effect c(r) = K_free^ρ(r)/K_ideal(r)
         *     first, so that a kernel agreeing with free space gives exactly the ideal exponent
         * @param rMin lower end, metres
         * @param rMax upper end, metres
         * @return the fit
         */
        public PowerLawFit fitSampled(ModeVariances variances, Component component, boolean divideRegulator,
                                      double rMin, double rMax) {
            Objects.requireNonNull(variances, "variances");
            double[] y = select(evaluate(sampledWeights(variances, -1)), component);
            double[] sigma = selectSe(standardErrors(variances.samples()), component, y);
            double[] c = divideRegulator ? correction(component) : ones();
            int[] range = range(rMin, rMax);
            double[] fit = Fits.powerLaw(separations, y, sigma, c, range[0], range[1]);
            int g = variances.groups();
            double[] jack = new double[g];
            double mean = 0;
            for (int k = 0; k < g; k++) {
                double[] yk = select(evaluate(sampledWeights(variances, k)), component);
                jack[k] = Fits.powerLaw(separations, yk, sigma, c, range[0], range[1])[0];
                mean += jack[k] / g;
            }
            double var = 0;
            for (double v : jack) {
                var += (v - mean) * (v - mean);
            }
            var *= (g - 1.0) / g;
            return new PowerLawFit(describe(component, "sampled"), fit[0], Math.sqrt(var), fit[2], fit[1],
                expected(component), separations[range[0]], separations[range[1] - 1], range[1] - range[0],
                method(component, divideRegulator) + String.format(Locale.ROOT,
                    "; error: delete-one-group jackknife over %d groups of samples (sample index mod %d)", g, g));
        }

        /**
         * The same fit to the mode sum with the exact variances (no sampling error).
         *
         * @param component what to fit
         * @param divideRegulator see {@link #fitSampled}
         * @param rMin lower end, metres
         * @param rMax upper end, metres
         * @return the fit, with zero errors
         */
        public PowerLawFit fitModeSum(Component component, boolean divideRegulator, double rMin, double rMax) {
            double[] y = select(evaluate(exact), component);
            double[] sigma = new double[y.length];
            for (int k = 0; k < y.length; k++) {
                sigma[k] = Math.abs(y[k]) * 1e-3;
            }
            double[] c = divideRegulator ? correction(component) : ones();
            int[] range = range(rMin, rMax);
            double[] fit = Fits.powerLaw(separations, y, sigma, c, range[0], range[1]);
            return new PowerLawFit(describe(component, "mode sum"), fit[0], 0.0, 0.0, fit[1], expected(component),
                separations[range[0]], separations[range[1] - 1], range[1] - range[0],
                method(component, divideRegulator) + "; equal weights in ln K (deterministic curve)");
        }

        private double expected(Component component) {
            return field == Field.A ? -4.0 : -2.0;
        }

        private String describe(Component component, String what) {
            return field + " kernel, " + (component == Component.PARALLEL ? "parallel" : "parallel - perpendicular")
                + ", " + what;
        }

        private String method(Component component, boolean divideRegulator) {
            return String.format(Locale.ROOT, "weighted least squares of ln|K| on ln r; regulator %s%s",
                regulatorText, divideRegulator ? ", its free-space effect K_free(r)/K_ideal(r) divided out" : "");
        }

        private double[] correction(Component component) {
            FreeSpaceSpectrum fs = freeSpace();
            Medium medium = table.cavity().medium();
            double[] c = new double[separations.length];
            for (int k = 0; k < c.length; k++) {
                double[] f = fs.components(separations[k]);
                double[] id = ideal(field, medium, separations[k]);
                c[k] = component == Component.PARALLEL ? f[0] / id[0] : (f[0] - f[1]) / (id[0] - id[1]);
            }
            return c;
        }

        private double[] ones() {
            double[] c = new double[separations.length];
            java.util.Arrays.fill(c, 1.0);
            return c;
        }

        private int[] range(double rMin, double rMax) {
            int lo = -1;
            int hi = -1;
            for (int k = 0; k < separations.length; k++) {
                if (separations[k] >= rMin * (1 - 1e-12) && separations[k] <= rMax * (1 + 1e-12)) {
                    if (lo < 0) {
                        lo = k;
                    }
                    hi = k + 1;
                }
            }
            if (lo < 0 || hi - lo < 2) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "fit range [%.6g, %.6g] m must hold at least 2 separations", rMin, rMax));
            }
            return new int[] {lo, hi};
        }

        private double[] select(double[][] v, Component component) {
            if (component == Component.PARALLEL) {
                return v[0];
            }
            double[] out = new double[v[0].length];
            for (int k = 0; k < out.length; k++) {
                out[k] = v[0][k] - v[1][k];
            }
            return out;
        }

        /** Errors of the selected component. */
        private double[] selectSe(double[][] se, Component component, double[] y) {
            return component == Component.PARALLEL ? se[0] : se[2];
        }
    }
}
