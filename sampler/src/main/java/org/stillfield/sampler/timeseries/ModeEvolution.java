package org.stillfield.sampler.timeseries;

import java.util.Objects;
import org.apache.commons.rng.sampling.distribution.NormalizedGaussianSampler;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;

/**
 * Exact one-step evolution of every mode amplitude over a fixed step dt (PHYSICS.md §5).
 *
 * <p><b>Lossless mode.</b> With e = −q̇ and q̈ = −ω²q the free solution is
 * <pre>
 *   q(t) = q cos ωt − (e/ω) sin ωt,   e(t) = ω q sin ωt + e cos ωt,
 * </pre>
 * i.e. the scaled vector x = (ωq, e) turns by the angle ωt: x(t) = R(ωt) x with
 * R(θ) = [[cos θ, −sin θ], [sin θ, cos θ]]. One step applies R(ω dt), whose cos and sin are
 * computed once; the per-mode energy (εV/2)(e² + ω²q²) = (εV/2)|x|² is kept to rounding.
 *
 * <p><b>Lossy mode</b> (κ = ω/Q &gt; 0). The mode is damped at κ/2 in amplitude and driven by white
 * input noise (vacuum or thermal), dx = (ωJ − κ/2) x dt + √κ σ dW with J the generator of R and W a
 * two-dimensional Wiener process; this is the damped mode of input–output theory (Gardiner &amp;
 * Collett, Phys. Rev. A 31, 3761 (1985), source from memory), a two-dimensional Ornstein–Uhlenbeck
 * process whose stationary covariance is isotropic, σ² 1, with σ² = σ_E² = ω²σ_A² the variance the
 * sampler draws (window weight and thermal factor included). Its exact discretisation over dt is
 * <pre>
 *   x_{n+1} = ρ R(ω dt) x_n + √(1 − ρ²) σ ξ_n,    ρ = e^{−κ dt/2},  ξ_n ~ N(0, 1₂),
 * </pre>
 * so a trajectory started from the Wigner draw stays in the stationary state at every step
 * (ρ²σ² + (1 − ρ²)σ² = σ²), and ⟨x(t) x(0)ᵀ⟩ = σ² e^{−κ|t|/2} R(ωt): the amplitude correlation is
 * σ² e^{−κ|t|/2} cos ωt and its spectrum a Lorentzian of FWHM κ (REFERENCE-VALUES.md §3). In (q, e):
 * <pre>
 *   q' = ρ(cos θ q − (sin θ/ω) e) + σ_A √(1−ρ²) ξ₁,   e' = ρ(ω sin θ q + cos θ e) + σ_E √(1−ρ²) ξ₂.
 * </pre>
 *
 * <p><b>Random numbers.</b> Each step draws, for every lossy mode in table order, two standard
 * normals from the sample's sampler: ξ₁ (the q quadrature) first, then ξ₂. Lossless modes draw
 * nothing. Changing this order changes every time series.
 *
 * <p>Immutable and thread-safe; the state arrays passed in are the caller's.
 */
public final class ModeEvolution {
    private final double dt;
    private final int modes;
    private final double[] qq;
    private final double[] qe;
    private final double[] eq;
    private final double[] ee;
    private final int[] lossy;
    private final double[] noiseQ;
    private final double[] noiseE;

    private ModeEvolution(ModeTable table, ModeDamping damping, double dt) {
        this.dt = dt;
        this.modes = table.size();
        qq = new double[modes];
        qe = new double[modes];
        eq = new double[modes];
        ee = new double[modes];
        int nLossy = damping.lossyCount();
        lossy = new int[nLossy];
        noiseQ = new double[nLossy];
        noiseE = new double[nLossy];
        int j = 0;
        for (int l = 0; l < modes; l++) {
            double w = table.omega(l);
            double theta = w * dt;
            double c = Math.cos(theta);
            double s = Math.sin(theta);
            double rho = Math.exp(-0.5 * damping.kappa(l) * dt);
            qq[l] = rho * c;
            qe[l] = -rho * s / w;
            eq[l] = rho * w * s;
            ee[l] = rho * c;
            if (damping.lossy(l)) {
                // 1 − ρ² = −expm1(−κ dt): keeps its relative precision when κ dt ≪ 1 (high Q).
                double oneMinusRho2 = -Math.expm1(-damping.kappa(l) * dt);
                lossy[j] = l;
                noiseQ[j] = Math.sqrt(table.variance(Field.A, l) * oneMinusRho2);
                noiseE[j] = Math.sqrt(table.variance(Field.E, l) * oneMinusRho2);
                j++;
            }
        }
    }

    /**
     * @param table modes and their (stationary) variances
     * @param damping Q and κ of the same modes
     * @param dtSeconds step, s, positive and finite
     * @return the stepper
     */
    public static ModeEvolution of(ModeTable table, ModeDamping damping, double dtSeconds) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(damping, "damping");
        if (damping.size() != table.size()) {
            throw new IllegalArgumentException("damping covers " + damping.size() + " modes but the table has "
                + table.size());
        }
        if (!(dtSeconds > 0) || !Double.isFinite(dtSeconds)) {
            throw new IllegalArgumentException("timeseries.dt_s must be positive and finite (seconds): " + dtSeconds);
        }
        return new ModeEvolution(table, damping, dtSeconds);
    }

    /** @return the step, s */
    public double dtSeconds() {
        return dt;
    }

    /** @return number of modes */
    public int modeCount() {
        return modes;
    }

    /** @return number of lossy modes, i.e. half the normal draws per step */
    public int lossyCount() {
        return lossy.length;
    }

    /**
     * Advances every mode by dt, in place.
     *
     * @param q q_l, length ≥ M, V·s/m
     * @param e e_l, length ≥ M, V/m
     * @param gauss the sample's standard-normal sampler (not used when every mode is lossless)
     */
    public void step(double[] q, double[] e, NormalizedGaussianSampler gauss) {
        for (int l = 0; l < modes; l++) {
            double q0 = q[l];
            double e0 = e[l];
            q[l] = qq[l] * q0 + qe[l] * e0;
            e[l] = eq[l] * q0 + ee[l] * e0;
        }
        for (int j = 0; j < lossy.length; j++) {
            int l = lossy[j];
            q[l] += noiseQ[j] * gauss.sample();
            e[l] += noiseE[j] * gauss.sample();
        }
    }

    /**
     * The lossless solution at time t straight from the formula of PHYSICS.md §5, for checks and
     * for single evaluations (stepping is cheaper for a grid).
     *
     * @param omega ω, rad/s
     * @param q0 q at t = 0
     * @param e0 e at t = 0
     * @param t time, s
     * @return {q(t), e(t)}
     */
    public static double[] lossless(double omega, double q0, double e0, double t) {
        double c = Math.cos(omega * t);
        double s = Math.sin(omega * t);
        return new double[] {q0 * c - e0 / omega * s, omega * q0 * s + e0 * c};
    }
}
