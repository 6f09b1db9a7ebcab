package org.stillfield.analysis;

import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;

/**
 * The walls' part of the windowed equal-time correlations C^E and c_m²C^B inside a PEC sphere and a
 * capped PEC cylinder, computed without the cavity's mode list: imaginary-frequency multipole sums
 * of the reflected Green dyadic. It is the reference the curved-cavity completeness tests compare
 * the mode sum against. Derived here (the method is common practice, the formulas below are not
 * taken from one place); lengths are in units of the window length a = c_m/ω_c and results in units
 * of C(0) = ħc_m/(π²εa⁴) per component (c_m²C^B in the same unit).
 *
 * <p><b>From the mode sum to imaginary frequency.</b> For a &gt; 0,
 * ∫_0^∞ cos(aκ) dκ/(k² + κ²) = π e^{−ak}/(2k) (a Fourier cosine transform, e.g. Gradshteyn &amp;
 * Ryzhik 3.723.2, source from memory), so k e^{−ak} = −(2/π) ∫_0^∞ cos(aκ) κ²/(k² + κ²) dκ (the
 * remaining ∫cos(aκ)dκ = πδ(a) vanishes for a &gt; 0). Inserted in C^E = (ħc_m/2ε) Σ_l k_l e^{−ak_l}
 * u_l u_l/V this gives C^E(r, r′) = −(ħc_m/πε) ∫_0^∞ cos(aκ) κ² G(r, r′; iκ) dκ with the transverse
 * resolvent G(k) = Σ_l u_l u_l/(V(k_l² − k²)). G differs from the cavity's Green dyadic only by its
 * longitudinal (static) part, which at k = iκ is a κ-independent term over κ² and so drops out in
 * the same way; for B the magnetic resolvent (1/k²)∇×∇′×G differs from Σ h_l h_l/(V(k_l² − k²)) only
 * by such a term. Splitting G = G_free + G_wall, the free part gives the free-space closed form, and
 * G_wall decays like e^{−2κ·(distance to the wall)}, so the κ integral of the wall part converges
 * absolutely. In units of C(0) (a = 1): wall part = −π ∫_0^∞ cos κ κ² G_wall(iκ) dκ.
 *
 * <p><b>Sphere</b> (radius R, point at distance r from the centre). Vector-wave expansion of the Green
 * dyadic, G = ik Σ_nm [M⊗M + N⊗N]/(n(n+1)) with real orthonormal harmonics (e.g. Tai, Dyadic Green
 * Functions in Electromagnetic Theory, 1994, source from memory; the normalisation reproduces
 * Im G_free(0,0) = k/6π), and the wall adds α_n = −h_n/j_n (TE: tangential M vanishes) and
 * β_n = −[xh_n]′/[xj_n]′ (TM) at x = kR on regular waves. Summing over m with Unsöld's theorem and
 * continuing to k = iκ (j_n(iy) = iⁿi_n(y), h_n(iy) = −(2/π)i^{−n}k̃_n(y) with the modified spherical
 * functions i_n and k̃_n(y) = √(π/2y) K_{n+½}(y)):
 * <pre>
 *   tr G_wall = (κ/2π²) Σ_n (2n+1) ρ_n² P_n [ −1 − t_n (n(n+1)/y² + (1/r_n(y) − n/y)²) ]      (E)
 *   tr G_wall = (κ/2π²) Σ_n (2n+1) ρ_n² P_n [ n(n+1)/y² + (1/r_n(y) − n/y)² + t_n ]           (c²B)
 * </pre>
 * with y = κr, Y = κR, ρ_n = i_n(y)/i_n(Y), P_n = i_n(Y)k̃_n(Y), r_n = i_n/i_{n−1},
 * s_n = k̃_n/k̃_{n−1} and t_n = [Yk̃_n]′/[Yi_n]′ · (−i_n/k̃_n) = (Y/s_n + n)/(Y/r_n(Y) − n). The terms
 * n(n+1)/y² are the radial component, the rest tangential. The B signs differ from a naive
 * M ↔ N swap because the continued N·N carries an extra factor −1 relative to M·M. Numerics: r_n
 * by downward recurrence, s_n upward from s_0 = 1, P_n from the Wronskian
 * i_n k̃_{n+1} + i_{n+1} k̃_n = π/(2Y²), ρ_n upward from ρ_0 = (sinh y/y)/(sinh Y/Y): no Bessel
 * function is ever formed, so nothing overflows.
 *
 * <p>At the centre only the n = 1 TM wave is nonzero, N_1m(0) = (2/3)√(3/4π) ê_m, which gives per
 * component −(1/3π) ∫ cos κ κ³ D(κR) dκ with D = [Yk̃_1]′/[Yi_1]′ (negative), i.e.
 * (1/6)(a/R)⁴ ∫_0^∞ cos(ay/R) y³ β(y) dy with
 * β = e^{−y}(1 + 1/y + 1/y²)/(sinh y − cosh y/y + sinh y/y²) → 2e^{−2y}: the mirror refocuses
 * on its centre, and the result, 0.519(a/R)⁴ at R = 8a, is 8.3 times one plane wall at distance R.
 * Between the centre and a point s the same wave gives
 * G_wall(0, s) = (κD/2π²)[2(i_1(y)/y) ŝŝ + (i_0(y) − i_1(y)/y)(I − ŝŝ)], y = κ|s|.
 *
 * <p><b>Capped cylinder</b> (radius R, length d; point at radius ρ, height z). The caps are planes
 * perpendicular to the axis, so the cavity's Green dyadic is the infinite cylinder's summed over the
 * caps' images (translations by 2md, S = I; reflections z → 2md − z with S_E = diag(−1,−1,+1),
 * S_B = diag(+1,+1,−1)). The free part over the images is the closed form image sum (as for the box);
 * the side-wall part, written as ∫dh e^{ihΔz} g(h), turns into (π/d) Σ_p g(h_p)(1 + S cos 2h_p z),
 * h_p = pπ/d, p ∈ Z (Poisson summation). g is the cylindrical-wave expansion
 * G = (i/8π)∫dh Σ_n λ^{−2}[M_n ⊗ M_n* + N_n ⊗ N_n*] (e.g. Chew, Waves and Fields in Inhomogeneous
 * Media, 1990, source from memory; the normalisation reproduces Im tr G_free = k/2π on the axis)
 * with wall coefficients −H_n′/J_n′ (TE) and −H_n/J_n (TM) at λR; at k = iκ, λ = iq,
 * q² = κ² + h²,
 * <pre>
 *   E: ρρ = c[Γ′ n²/ρ² − Γ h² L²/κ²]   φφ = c[Γ′ L² − Γ h² n²/(κ²ρ²)]   zz = −c Γ q⁴/κ²
 *   B: ρρ = c[−Γ′ h² L²/κ² + Γ n²/ρ²]  φφ = c[−Γ′ h² n²/(κ²ρ²) + Γ L²]  zz = −c Γ′ q⁴/κ²
 * </pre>
 * per n ∈ Z, with c = 1/(4π²q²), y = qρ, Q = qR, Γ = I_n(y)² K_n(Q)/I_n(Q),
 * Γ′ = I_n(y)² K_n′(Q)/I_n′(Q) and L = q I_n′(y)/I_n(y). Numerics as for the sphere with the
 * cylindrical recurrences; the only Bessel values needed are e^x K_0(x) and e^x K_1(x), from the
 * trapezoidal rule on ∫_0^∞ e^{−x(cosh t − 1)} cosh(νt) dt (A&amp;S 9.6.24, source from memory).
 *
 * <p><b>Accuracy.</b> κ integrals: 24 panels of a 12-point Gauss–Legendre rule on [0, 22/w], w the
 * distance to the nearest wall (the integrand is below e^{−44} beyond), the first panel halved 12
 * times towards 0 for the κ² ln κ behaviour of the cylinder's p = 0 terms; the n sums stop when a
 * term is 1e-17 of the sum (an unconverged sum throws); the p sum stops at h_p = 22/w. Doubling the
 * panels, raising the cutoff to 58/w, 16 nodes, a 1e-19 stop and half the trapezoidal step change
 * no result used by the tests by more than 1e-14 C(0).
 */
final class CurvedWallReflection {
    private static final int PANELS = 24;
    private static final int GRADED_LEVELS = 12;
    private static final double DECAY = 22.0;
    private static final double STOP = 1e-17;
    private static final int CAP_IMAGES = 400;
    private static final double[] NODES;
    private static final double[] WEIGHTS;

    static {
        GaussIntegrator rule = new GaussIntegratorFactory().legendre(12);
        NODES = new double[rule.getNumberOfPoints()];
        WEIGHTS = new double[NODES.length];
        for (int i = 0; i < NODES.length; i++) {
            NODES[i] = rule.getPoint(i);
            WEIGHTS[i] = rule.getWeight(i);
        }
    }

    private CurvedWallReflection() {
    }

    /** Integrand f(κ) into out (length n), for {@link #integrate}. */
    private interface Integrand {
        void eval(double kappa, double[] out);
    }

    /**
     * ∫_0^kMax cos κ · κ² · f(κ) dκ, component-wise: equal panels, the first one split
     * geometrically towards 0 because the cylinder's p = 0 terms go like κ² ln κ there (K_0).
     */
    private static double[] integrate(double kMax, int n, Integrand f) {
        double[] acc = new double[n];
        double[] v = new double[n];
        double h = kMax / PANELS;
        for (int p = 1; p < PANELS; p++) {
            panel(p * h, (p + 1) * h, n, f, acc, v);
        }
        double hi = h;
        for (int level = 0; level < GRADED_LEVELS; level++) {
            panel(0.5 * hi, hi, n, f, acc, v);
            hi *= 0.5;
        }
        panel(0.0, hi, n, f, acc, v);
        return acc;
    }

    private static void panel(double lo, double hi, int n, Integrand f, double[] acc, double[] v) {
        double mid = 0.5 * (lo + hi);
        double half = 0.5 * (hi - lo);
        for (int i = 0; i < NODES.length; i++) {
            double k = mid + half * NODES[i];
            double w = half * WEIGHTS[i] * Math.cos(k) * k * k;
            java.util.Arrays.fill(v, 0.0);
            f.eval(k, v);
            for (int j = 0; j < n; j++) {
                acc[j] += w * v[j];
            }
        }
    }

    // ---------------------------------------------------------------- sphere

    /**
     * Wall part of C^E and c²C^B at distance r from the centre of a sphere, 0 &lt; r &lt; R.
     *
     * @param radius R/a
     * @param r r/a
     * @return {E radial, E tangential (sum of both), c²B radial, c²B tangential}, units C(0)
     */
    static double[] sphere(double radius, double r) {
        if (!(r > 0 && r < radius)) {
            throw new IllegalArgumentException("r must lie in (0, radius): " + r);
        }
        double[] t = integrate(DECAY / (radius - r), 4, (k, out) -> sphereGreen(k, r, radius, out));
        for (int j = 0; j < 4; j++) {
            t[j] *= -Math.PI;
        }
        return t;
    }

    /** Sphere: tr G_wall(r, r; iκ) split into {E rad, E tan, B rad, B tan}. */
    private static void sphereGreen(double kappa, double r, double radius, double[] out) {
        double y = kappa * r;
        double bigY = kappa * radius;
        // Terms fall like (r/R)^{2n} at small κ and like e^{−2κ(R − r)√(1 + n²/Y²)} at large κ.
        int n0 = (int) (2 * bigY + 40 / Math.log(radius / r)) + 100;
        double[] ry = ratiosSpherical(y, n0);
        double[] rY = ratiosSpherical(bigY, n0);
        double[] sY = new double[n0 + 2];
        sY[0] = 1.0;
        for (int n = 0; n <= n0; n++) {
            sY[n + 1] = 1.0 / sY[n] + (2 * n + 1) / bigY;
        }
        // ρ_0 = (sinh y / y) / (sinh Y / Y)
        double rho = (bigY / y) * Math.exp(y - bigY) * Math.expm1(-2 * y) / Math.expm1(-2 * bigY);
        double eRad = 0;
        double eTan = 0;
        double bRad = 0;
        double bTan = 0;
        for (int n = 1; n <= n0; n++) {
            rho *= ry[n] / rY[n];
            double p = 0.5 * Math.PI / (bigY * bigY * (sY[n + 1] + rY[n + 1]));
            double g = (2 * n + 1) * rho * rho * p;
            double radial = n * (n + 1.0) / (y * y);
            double l = 1.0 / ry[n] - n / y;
            double tangential = l * l;
            double tm = (bigY / sY[n] + n) / (bigY / rY[n] - n);
            double dERad = -g * tm * radial;
            double dETan = -g * (1 + tm * tangential);
            double dBRad = g * radial;
            double dBTan = g * (tangential + tm);
            eRad += dERad;
            eTan += dETan;
            bRad += dBRad;
            bTan += dBTan;
            if (n > bigY && Math.abs(dETan) + Math.abs(dBTan) + Math.abs(dERad) + Math.abs(dBRad)
                < STOP * (Math.abs(eTan) + Math.abs(bTan))) {
                break;
            }
            if (n == n0) {
                throw new IllegalStateException("sphere multipole sum not converged at n = " + n0 + ", κ = " + kappa);
            }
        }
        double pre = kappa / (2 * Math.PI * Math.PI);
        out[0] = pre * eRad;
        out[1] = pre * eTan;
        out[2] = pre * bRad;
        out[3] = pre * bTan;
    }

    /** r[n] = i_n(y)/i_{n−1}(y) for n = 1 … n0 + 1 (downward recurrence from far above). */
    private static double[] ratiosSpherical(double y, int n0) {
        double[] r = new double[n0 + 2];
        double rr = 0.0;
        for (int n = Math.max(n0 + 1, (int) y) + 60; n >= 1; n--) {
            rr = 1.0 / ((2 * n + 1) / y + rr);
            if (n <= n0 + 1) {
                r[n] = rr;
            }
        }
        return r;
    }

    /** D(Y) = [Y k̃_1]′/[Y i_1]′ · e^{2Y} (negative), scaled so that large Y does not underflow. */
    private static double centreWaveScaled(double bigY) {
        double[] rY = ratiosSpherical(bigY, 2);
        double s1 = 1.0 + 1.0 / bigY;
        double s2 = 1.0 / s1 + 3.0 / bigY;
        double p1 = 0.5 * Math.PI / (bigY * bigY * (s2 + rY[2]));
        double i0Scaled = -Math.expm1(-2 * bigY) / (2 * bigY); // i_0(Y) e^{−Y}
        double i1Scaled = i0Scaled * rY[1];
        double ratioScaled = p1 / (i1Scaled * i1Scaled); // k̃_1/i_1 · e^{2Y}
        return -ratioScaled * (bigY / s1 + 1) / (bigY / rY[1] - 1);
    }

    /**
     * Wall part of C^E_ii at the centre of a sphere (the same for the three components).
     *
     * @param radius R/a
     * @return units C(0)
     */
    static double sphereCentre(double radius) {
        double[] t = integrate(DECAY / radius, 1, (k, out) ->
            out[0] = k * centreWaveScaled(k * radius) * Math.exp(-2 * k * radius));
        return -t[0] / (3 * Math.PI);
    }

    /**
     * Wall part of C^E_ij(centre, centre + s) in a sphere.
     *
     * @param radius R/a
     * @param s separation in units of a, |s| &lt; R
     * @return 3×3 tensor, units C(0)
     */
    static double[][] sphereCentrePair(double radius, double[] s) {
        double len = Math.sqrt(s[0] * s[0] + s[1] * s[1] + s[2] * s[2]);
        if (!(len > 0 && len < radius)) {
            throw new IllegalArgumentException("|s| must lie in (0, radius): " + len);
        }
        // Decays like e^{−κ(2R − |s|)}.
        double[] t = integrate(2 * DECAY / (2 * radius - len), 2, (k, out) -> {
            double y = k * len;
            double[] ry = ratiosSpherical(y, 2);
            double i0Scaled = -Math.expm1(-2 * y) / (2 * y); // i_0(y) e^{−y}
            double i1OverY = i0Scaled / (3 + y * ry[2]);     // i_1(y)/y · e^{−y}
            double common = k * centreWaveScaled(k * radius) * Math.exp(y - 2 * k * radius) / (2 * Math.PI * Math.PI);
            out[0] = common * 2 * i1OverY;            // along ŝ
            out[1] = common * (i0Scaled - i1OverY);   // across ŝ
        });
        double par = -Math.PI * t[0];
        double perp = -Math.PI * t[1];
        double[][] c = new double[3][3];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                double outer = s[i] * s[j] / (len * len);
                c[i][j] = par * outer + perp * ((i == j ? 1 : 0) - outer);
            }
        }
        return c;
    }

    // -------------------------------------------------------------- cylinder

    /**
     * Wall part (side wall and caps) of C^E and c²C^B in a capped cylinder at radius ρ, height z.
     *
     * @param radius R/a
     * @param length d/a
     * @param rho ρ/a, in [0, R)
     * @param z z/a, in (0, d)
     * @return {E ρρ, E φφ, E zz, c²B ρρ, c²B φφ, c²B zz}, units C(0) (on the axis ρρ = φφ = xx = yy)
     */
    static double[] cylinder(double radius, double length, double rho, double z) {
        if (!(rho >= 0 && rho < radius) || !(z > 0 && z < length)) {
            throw new IllegalArgumentException("point must lie inside the cylinder: rho = " + rho + ", z = " + z);
        }
        double w = radius - rho;
        double hMax = DECAY / w;
        int pMax = (int) Math.ceil(hMax * length / Math.PI);
        double[] sE = {-1, -1, 1};
        double[] t = integrate(DECAY / w, 6, (k, out) -> {
            double[] g = new double[6];
            for (int p = 0; p <= pMax; p++) {
                double h = p * Math.PI / length;
                java.util.Arrays.fill(g, 0.0);
                cylinderGreen(k, h, rho, radius, g);
                double c2 = Math.cos(2 * h * z);
                double mult = (p == 0 ? 1.0 : 2.0) * Math.PI / length;
                for (int i = 0; i < 3; i++) {
                    out[i] += mult * g[i] * (1 + sE[i] * c2);
                    out[3 + i] += mult * g[3 + i] * (1 - sE[i] * c2);
                }
            }
        });
        double[] res = new double[6];
        for (int j = 0; j < 6; j++) {
            res[j] = -Math.PI * t[j];
        }
        // Caps: free-space closed form (a = 1) over the images, separation along the axis.
        for (int m = -CAP_IMAGES; m <= CAP_IMAGES; m++) {
            for (int refl = 0; refl < 2; refl++) {
                if (refl == 0 && m == 0) {
                    continue;
                }
                double dz = refl == 0 ? 2.0 * m * length : 2 * z - 2.0 * m * length;
                double s = dz * dz + 1;
                double perp = (1 - dz * dz) / (s * s * s);
                double par = 1 / (s * s);
                // Translations: S = I. Reflections: S_E = (−1, −1, +1), S_B = (+1, +1, −1).
                double sgn = refl == 0 ? 1 : -1;
                res[0] += sgn * perp;
                res[1] += sgn * perp;
                res[2] += par;
                res[3] += perp;
                res[4] += perp;
                res[5] += sgn * par;
            }
        }
        return res;
    }

    /** Side-wall integrand g(h) at k = iκ: {E ρρ, φφ, zz, B ρρ, φφ, zz}, added to out. */
    private static void cylinderGreen(double kappa, double h, double rho, double radius, double[] out) {
        double q = Math.hypot(kappa, h);
        double bigQ = q * radius;
        double c = 1.0 / (4 * Math.PI * Math.PI * q * q);
        double k2 = kappa * kappa;
        double q2 = q * q;
        double h2 = h * h;
        double ek0Q = scaledK(0, bigQ);
        double ek1Q = scaledK(1, bigQ);
        if (rho == 0) {
            // Axis: n = 0 (I_0 = 1) and n = ±1 (I_1/ρ → q/2, I_1′ → 1/2) only.
            double[] rQ = ratiosCylindrical(bigQ, 2);
            double s1 = ek1Q / ek0Q;
            double i0 = 1.0 / (bigQ * ek0Q * (s1 + rQ[1]));   // I_0(Q) e^{−Q}
            double i1 = i0 * rQ[1];
            double e2 = Math.exp(-2 * bigQ);
            double ki0 = ek0Q / i0 * e2;
            double ki1 = ek1Q / i1 * e2;
            double dki0 = ki0 * -s1 / rQ[1];
            double dki1 = ki1 * (-1 / s1 - 1 / bigQ) / (1 / rQ[1] - 1 / bigQ);
            double tr = 2 * c * (dki1 * q2 / 4 - ki1 * h2 * q2 / (4 * k2));
            out[0] += tr;
            out[1] += tr;
            out[2] += -c * ki0 * q2 * q2 / k2;
            double br = 2 * c * (-dki1 * h2 * q2 / (4 * k2) + ki1 * q2 / 4);
            out[3] += br;
            out[4] += br;
            out[5] += -c * dki0 * q2 * q2 / k2;
            return;
        }
        double y = q * rho;
        int n0 = (int) (2 * bigQ + 40 / Math.log(radius / rho)) + 100;
        double[] rQ = ratiosCylindrical(bigQ, n0);
        double[] ry = ratiosCylindrical(y, n0);
        double[] sQ = new double[n0 + 2];
        sQ[1] = ek1Q / ek0Q;
        for (int n = 1; n <= n0; n++) {
            sQ[n + 1] = 1.0 / sQ[n] + 2.0 * n / bigQ;
        }
        double ek0y = scaledK(0, y);
        double s1y = scaledK(1, y) / ek0y;
        // ρ_0 = I_0(y)/I_0(Q) from the Wronskian I_0 K_1 + I_1 K_0 = 1/x.
        double rhoN = (bigQ * ek0Q * (sQ[1] + rQ[1])) / (y * ek0y * (s1y + ry[1])) * Math.exp(y - bigQ);
        double[] acc = new double[6];
        for (int n = 0; n <= n0; n++) {
            if (n > 0) {
                rhoN *= ry[n] / rQ[n];
            }
            double p = 1.0 / (bigQ * (sQ[n + 1] + rQ[n + 1]));
            double gam = p * rhoN * rhoN;
            double dlK = n == 0 ? -sQ[1] : -1.0 / sQ[n] - n / bigQ;
            double dlI = n == 0 ? rQ[1] : 1.0 / rQ[n] - n / bigQ;
            double gamP = gam * dlK / dlI;
            double l = n == 0 ? ry[1] : 1.0 / ry[n] - n / y;
            double l2 = l * l;
            double ny2 = (double) n * n / (y * y);
            double mult = n == 0 ? c : 2 * c;
            double[] d = {
                mult * (gamP * ny2 * q2 - gam * h2 * q2 * l2 / k2),
                mult * (gamP * q2 * l2 - gam * h2 * ny2 * q2 / k2),
                -mult * gam * q2 * q2 / k2,
                mult * (-gamP * h2 * q2 * l2 / k2 + gam * ny2 * q2),
                mult * (-gamP * h2 * ny2 * q2 / k2 + gam * q2 * l2),
                -mult * gamP * q2 * q2 / k2,
            };
            double change = 0;
            double size = 0;
            for (int j = 0; j < 6; j++) {
                acc[j] += d[j];
                change += Math.abs(d[j]);
                size += Math.abs(acc[j]);
            }
            if (n > bigQ && change < STOP * size) {
                break;
            }
            if (n == n0) {
                throw new IllegalStateException("cylinder multipole sum not converged at n = " + n0 + ", q = " + q);
            }
        }
        for (int j = 0; j < 6; j++) {
            out[j] += acc[j];
        }
    }

    /** r[n] = I_n(y)/I_{n−1}(y) for n = 1 … n0 + 1 (downward recurrence). */
    private static double[] ratiosCylindrical(double y, int n0) {
        double[] r = new double[n0 + 2];
        double rr = 0.0;
        for (int n = Math.max(n0 + 1, (int) y) + 60; n >= 1; n--) {
            rr = 1.0 / (2.0 * n / y + rr);
            if (n <= n0 + 1) {
                r[n] = rr;
            }
        }
        return r;
    }

    /**
     * e^x K_ν(x) by the trapezoidal rule on ∫_0^∞ e^{−x(cosh t − 1)} cosh(νt) dt. Step
     * min(0.2, 0.5/√x): the integrand is analytic in |Im t| &lt; π/2 (error ~e^{−π²/step}) and for
     * large x a peak of width 1/√x (error ~e^{−2π²/(x step²)} = e^{−79}).
     */
    static double scaledK(int nu, double x) {
        double step = Math.min(0.2, 0.5 / Math.sqrt(x));
        double sum = 0.5;
        for (int i = 1; ; i++) {
            double t = i * step;
            double v = Math.exp(-x * (Math.cosh(t) - 1)) * Math.cosh(nu * t);
            sum += v;
            if (v < 1e-18 * sum) {
                break;
            }
        }
        return step * sum;
    }
}
