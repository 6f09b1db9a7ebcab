package org.stillfield.analysis.spectra;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.TimeGrid;

/**
 * Analytic two-time correlation and spectrum of two probe signals x = Σ(a_l e_l + b_l q_l) and
 * y = Σ(a'_l e_l + b'_l q_l) (PHYSICS.md §5).
 *
 * <p>Each mode's scaled amplitude (ωq, e) has ⟨x(t) x(0)ᵀ⟩ = σ² e^{−κ|t|/2} R(ωt) (σ² = σ_E², window and
 * thermal factor included; κ = 0 for a lossless mode), so
 * <pre>
 *   C(τ) = ⟨x(t+τ) y(t)⟩ = Σ_l σ_l² e^{−κ_l|τ|/2} [A_l cos ω_lτ + B_l sin ω_lτ],
 *   A_l = a_l a'_l + b_l b'_l/ω_l²,   B_l = (a_l b'_l − b_l a'_l)/ω_l,
 * </pre>
 * which for x = y is Σ c_l² σ_l² cos(ω_l τ) e^{−κ_l|τ|/2}. Its one-sided cross spectrum (convention of
 * {@link CsdEstimate}, transform of ⟨x(t) y(t+τ)⟩ = C(−τ)) is, for f &gt; 0 and Ω = 2πf,
 * <pre>
 *   G(f) = Σ_l σ_l² {A_l [L(Ω−ω_l) + L(Ω+ω_l)] + i B_l [L(Ω−ω_l) − L(Ω+ω_l)]},  L(Δ) = κ/((κ/2)² + Δ²),
 * </pre>
 * a sum of Lorentzians of FWHM κ_l (rad/s), κ_l/2π in Hz, each integrating to σ_l²A_l over f
 * (standard input–output result, Gardiner &amp; Collett, Phys. Rev. A 31, 3761 (1985), source from memory).
 * Lossless modes give lines of power σ_l²(A_l + iB_l) at f_l instead ({@link #lines()}). Sampled at Δt the
 * process has the periodised spectrum {@link #sampledSpectrum} (exact for the simulated discretisation).
 */
public final class ProbeNoiseModel {
    /**
     * A discrete line of a lossless mode.
     *
     * @param mode mode index in the table
     * @param label mode label
     * @param frequencyHz resonance f_l, Hz
     * @param power Re of the line power σ²A (for x = y the variance it carries), unit²
     * @param quadrature Im of the line power σ²B
     */
    public record Line(int mode, String label, double frequencyHz, double power, double quadrature) {
    }

    private final ModeTable table;
    private final double[] omega;
    private final double[] kappa;
    private final double[] vacuumVar;
    private final double[] var;
    private final double[] cosW;
    private final double[] sinW;
    private final double temperature;

    private ProbeNoiseModel(ModeTable table, double[] omega, double[] kappa, double[] vacuumVar, double[] cosW,
                            double[] sinW, double temperature) {
        this.table = table;
        this.omega = omega;
        this.kappa = kappa;
        this.vacuumVar = vacuumVar;
        this.cosW = cosW;
        this.sinW = sinW;
        this.temperature = temperature;
        ThermalState state = new ThermalState(temperature);
        var = new double[omega.length];
        for (int l = 0; l < omega.length; l++) {
            var[l] = vacuumVar[l] * state.varianceFactor(omega[l]);
        }
    }

    /**
     * @param table modes, window and state
     * @param damping κ per mode
     * @param x first probe
     * @param y second probe (the same for an auto spectrum)
     * @return the model, at the table's temperature
     */
    public static ProbeNoiseModel of(ModeTable table, ModeDamping damping, ProbeCoefficients x, ProbeCoefficients y) {
        Objects.requireNonNull(table, "table");
        int m = table.size();
        if (damping.size() != m || x.modeCount() != m || y.modeCount() != m) {
            throw new IllegalArgumentException("table, damping and probes must cover the same " + m + " modes");
        }
        double[] omega = table.omegas();
        double[] kappa = damping.kappas();
        double[] vac = new double[m];
        double[] a = new double[m];
        double[] b = new double[m];
        for (int l = 0; l < m; l++) {
            vac[l] = table.weight(l) * table.vacuumVariance(Field.E, l);
            double w = omega[l];
            a[l] = x.onE(l) * y.onE(l) + x.onQ(l) * y.onQ(l) / (w * w);
            b[l] = (x.onE(l) * y.onQ(l) - x.onQ(l) * y.onE(l)) / w;
        }
        return new ProbeNoiseModel(table, omega, kappa, vac, a, b, table.state().temperatureKelvin());
    }

    /** @return the same probes and modes at another temperature (K, ≥ 0) */
    public ProbeNoiseModel withTemperature(double temperatureKelvin) {
        return new ProbeNoiseModel(table, omega, kappa, vacuumVar, cosW, sinW, temperatureKelvin);
    }

    /** @return temperature of the state, K */
    public double temperatureKelvin() {
        return temperature;
    }

    /**
     * @param tauSeconds τ, s
     * @return C(τ) = ⟨x(t+τ) y(t)⟩, the symmetrised two-time correlation
     */
    public double correlation(double tauSeconds) {
        double s = 0;
        double at = Math.abs(tauSeconds);
        for (int l = 0; l < omega.length; l++) {
            double ph = omega[l] * tauSeconds;
            s += var[l] * Math.exp(-0.5 * kappa[l] * at) * (cosW[l] * Math.cos(ph) + sinW[l] * Math.sin(ph));
        }
        return s;
    }

    /** @return ⟨x y⟩ at equal times, C(0) */
    public double covariance() {
        double s = 0;
        for (int l = 0; l < omega.length; l++) {
            s += var[l] * cosW[l];
        }
        return s;
    }

    /**
     * @param fHz frequency &gt; 0, Hz
     * @return {Re, Im} of the one-sided continuous spectrum of the lossy modes, unit²/Hz
     */
    public double[] spectrum(double fHz) {
        double big = 2 * Math.PI * fHz;
        double re = 0;
        double im = 0;
        for (int l = 0; l < omega.length; l++) {
            if (kappa[l] > 0) {
                double lm = lorentz(big - omega[l], kappa[l]);
                double lp = lorentz(big + omega[l], kappa[l]);
                re += var[l] * cosW[l] * (lm + lp);
                im += var[l] * sinW[l] * (lm - lp);
            }
        }
        return new double[] {re, im};
    }

    /** @return Re of {@link #spectrum}: the PSD when x = y */
    public double psd(double fHz) {
        return spectrum(fHz)[0];
    }

    private static double lorentz(double delta, double kappa) {
        return kappa / (0.25 * kappa * kappa + delta * delta);
    }

    /**
     * One-sided spectrum of the lossy modes sampled at Δt: the sampled correlation
     * σ²ρ^{|n|}[A cos θn ∓ B sin θn], ρ = e^{−κΔt/2}, θ = ωΔt, has the transform
     * Δt σ² {A[P(φ−θ) + P(φ+θ)] + iB[P(φ−θ) − P(φ+θ)]}, P(φ) = (1−ρ²)/(1 − 2ρ cos φ + ρ²), φ = 2πfΔt —
     * the Lorentzians with all their aliases (→ {@link #spectrum} as Δt → 0).
     *
     * @param fHz frequency in [0, 1/(2Δt)], Hz
     * @param dtSeconds Δt, s
     * @return {Re, Im}, unit²/Hz
     */
    public double[] sampledSpectrum(double fHz, double dtSeconds) {
        double phi = 2 * Math.PI * fHz * dtSeconds;
        double re = 0;
        double im = 0;
        for (int l = 0; l < omega.length; l++) {
            if (kappa[l] > 0) {
                double rho = Math.exp(-0.5 * kappa[l] * dtSeconds);
                double oneMinus = -Math.expm1(-kappa[l] * dtSeconds);
                double th = omega[l] * dtSeconds;
                double pm = oneMinus / (1 - 2 * rho * Math.cos(phi - th) + rho * rho);
                double pp = oneMinus / (1 - 2 * rho * Math.cos(phi + th) + rho * rho);
                re += var[l] * cosW[l] * (pm + pp);
                im += var[l] * sinW[l] * (pm - pp);
            }
        }
        return new double[] {dtSeconds * re, dtSeconds * im};
    }

    /** @return lines of the lossless modes that the probes see (A or B non-zero) */
    public List<Line> lines() {
        List<Line> out = new ArrayList<>();
        for (int l = 0; l < omega.length; l++) {
            if (kappa[l] == 0 && (cosW[l] != 0 || sinW[l] != 0)) {
                out.add(new Line(l, table.modes().get(l).label(), table.frequency(l), var[l] * cosW[l],
                    var[l] * sinW[l]));
            }
        }
        return out;
    }

    /**
     * Power in [f1, f2] of Re G: Lorentzian integrals (1/π)[atan(2Δ/κ)] of every lossy mode (with its
     * mirror term) plus the lines of lossless modes inside the band.
     *
     * @param f1Hz lower edge, Hz, ≥ 0
     * @param f2Hz upper edge, Hz, ≥ f1
     * @return band power, unit² (the variance for [0, ∞) and x = y)
     */
    public double bandPower(double f1Hz, double f2Hz) {
        return bandPower(f1Hz, f2Hz, var);
    }

    private double bandPower(double f1Hz, double f2Hz, double[] v) {
        if (!(f1Hz >= 0) || !(f2Hz >= f1Hz)) {
            throw new IllegalArgumentException("band must satisfy 0 <= f1 <= f2 (Hz): [" + f1Hz + ", " + f2Hz + "]");
        }
        double w1 = 2 * Math.PI * f1Hz;
        double w2 = 2 * Math.PI * f2Hz;
        double s = 0;
        for (int l = 0; l < omega.length; l++) {
            double f;
            if (kappa[l] > 0) {
                double k = kappa[l];
                f = (atanBand(w2 - omega[l], w1 - omega[l], k) + atanBand(w2 + omega[l], w1 + omega[l], k)) / Math.PI;
            } else {
                f = table.frequency(l) >= f1Hz && table.frequency(l) <= f2Hz ? 1.0 : 0.0;
            }
            s += v[l] * cosW[l] * f;
        }
        return s;
    }

    private static double atanBand(double d2, double d1, double k) {
        double x2 = Double.isInfinite(d2) ? Math.signum(d2) * Math.PI / 2 : Math.atan(2 * d2 / k);
        return x2 - Math.atan(2 * d1 / k);
    }

    /**
     * Fraction of the equal-time covariance (x = y: of the variance) carried by modes at or above
     * the Nyquist frequency of the grid, which fold to other frequencies in a spectrum of the series.
     *
     * @param grid the sampling
     * @return fraction in [0, 1] for x = y
     */
    public double aliasedFraction(TimeGrid grid) {
        double all = 0;
        double aliased = 0;
        for (int l = 0; l < omega.length; l++) {
            double c = var[l] * cosW[l];
            all += c;
            if (omega[l] >= grid.nyquistOmega()) {
                aliased += c;
            }
        }
        return all == 0 ? 0 : aliased / all;
    }

    /**
     * Equivalent noise temperature of a measured band power (x = y), convention of
     * {@link NoiseTemperature}: T_eq = T_Q(f_c) · P/P_vacuum with f_c the band centre; exact for a
     * band narrow compared with f_c.
     *
     * @param f1Hz lower edge, Hz
     * @param f2Hz upper edge, Hz
     * @param measuredPower band power, unit²
     * @return T_eq, K
     */
    public double bandEquivalentTemperature(double f1Hz, double f2Hz, double measuredPower) {
        double vac = bandPower(f1Hz, f2Hz, vacuumVar);
        if (!(vac > 0)) {
            throw new IllegalArgumentException("the probes see no vacuum power in [" + f1Hz + ", " + f2Hz + "] Hz");
        }
        return NoiseTemperature.fromVarianceRatio(Math.PI * (f1Hz + f2Hz), measuredPower / vac);
    }

    /**
     * The temperature at which the model's band power equals a measured one (x = y), solved with
     * Brent's method; exact for any band and any number of modes in it.
     *
     * @param f1Hz lower edge, Hz
     * @param f2Hz upper edge, Hz
     * @param measuredPower band power, unit²
     * @return T, K; 0 when the power does not exceed the vacuum band power
     */
    public double bandTemperature(double f1Hz, double f2Hz, double measuredPower) {
        double vac = bandPower(f1Hz, f2Hz, vacuumVar);
        if (!(vac > 0)) {
            throw new IllegalArgumentException("the probes see no vacuum power in [" + f1Hz + ", " + f2Hz + "] Hz");
        }
        if (measuredPower <= vac) {
            return 0;
        }
        // Search in log T: band power grows monotonically with T (every coth factor does).
        double hi = 1e-3;
        while (withTemperature(hi).bandPower(f1Hz, f2Hz) < measuredPower) {
            hi *= 4;
            if (hi > 1e12) {
                throw new IllegalArgumentException("band power " + measuredPower + " needs T > 1e12 K");
            }
        }
        double lo = hi / 4;
        while (lo > 1e-9 && withTemperature(lo).bandPower(f1Hz, f2Hz) > measuredPower) {
            lo /= 4;
        }
        double target = measuredPower;
        double logT = new BrentSolver(1e-14, 1e-13).solve(200,
            u -> withTemperature(Math.exp(u)).bandPower(f1Hz, f2Hz) / target - 1, Math.log(lo), Math.log(hi));
        return Math.exp(logT);
    }
}
