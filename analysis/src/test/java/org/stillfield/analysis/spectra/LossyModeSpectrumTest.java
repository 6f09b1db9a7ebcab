package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.timeseries.LossModel;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.SeriesAssembler;
import org.stillfield.sampler.timeseries.TimeGrid;
import org.stillfield.sampler.timeseries.TimeSeriesRunner;

/**
 * Spectrum of one lossy mode read by two probes, against PHYSICS.md §5: Lorentzian of FWHM κ = ω/Q,
 * integrating to the (thermal) variance. One run shared by the checks: TE101 of the 3x2x4 cm box
 * (6.2457 GHz, the only mode below 7 GHz), thermal at 0.2 K, Q = 10, dt placing f0 at bin 160 of
 * L = 512 so the FWHM spans 16 bins; 1024 samples of 8192 steps (31 segments each).
 *
 * <p>False-failure budget of this class: 1e-6, split evenly over five families of checks (per-bin
 * bands, FWHM, Parseval, cross spectrum, temperature), 2e-7 each (normal z = 5.2).
 */
class LossyModeSpectrumTest {
    private static final long SEED = 20261130L;
    private static final int LEN = 512;
    private static final int STEPS = 8192;
    private static final int SAMPLES = 1024;
    private static final double Q = 10;
    private static final double TEMPERATURE = 0.2;
    private static final double FAMILY_ALPHA = 2e-7;

    private static ModeTable table;
    private static ModeDamping damping;
    private static double dt;
    private static ProbeCoefficients dipole;
    private static ProbeCoefficients loop;
    private static PsdEstimate ensemble;
    private static double[] perSamplePower;
    private static double[] perSampleQuad;
    private static double[][] ensembleCsd;
    private static int quadLo;
    private static int quadHi;

    @BeforeAll
    static void run() throws IOException {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        table = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 7e9, Window.DEFAULT_TOLERANCE),
            new ThermalState(TEMPERATURE), 100);
        damping = ModeDamping.of(table, LossModel.constant(Q));
        dt = 160.0 / (LEN * table.frequency(0));
        List<Probe> probes = List.of(
            new Probe.ElectricDipole("pin", new Vec3(0.015, 0.01, 0.02), new Vec3(0, 1, 0), 0.01),
            new Probe.MagneticLoop("loop", new Vec3(0.0075, 0.01, 0.02), new Vec3(0, 0, 1), 1e-5,
                Probe.LoopOutput.FLUX));
        dipole = probes.get(0).coefficients(table);
        loop = probes.get(1).coefficients(table);
        WelchPsd psd = WelchPsd.of(LEN, dt, Detrend.NONE);
        WelchCsd csdAll = WelchCsd.of(LEN, dt, Detrend.NONE);
        perSamplePower = new double[SAMPLES];
        perSampleQuad = new double[SAMPLES];
        double f0 = table.frequency(0);
        double gamma = f0 / Q;
        double df = 1.0 / (LEN * dt);
        quadLo = (int) Math.round((f0 - gamma) / df);
        quadHi = (int) Math.round((f0 + gamma) / df);
        SeriesAssembler sink = new SeriesAssembler(new int[] {0, 1}, STEPS, (sample, s) -> {
            psd.add(s[0]);
            csdAll.add(s[0], s[1]);
            WelchCsd one = WelchCsd.of(LEN, dt, Detrend.NONE);
            one.add(s[0], s[1]);
            CsdEstimate e = one.estimate();
            double p = 0;
            double quad = 0;
            for (int k = 0; k < e.size(); k++) {
                p += e.psdX(k);
                if (k >= quadLo && k <= quadHi) {
                    quad += e.imaginary(k);
                }
            }
            perSamplePower[(int) sample] = p * e.resolutionHz();
            perSampleQuad[(int) sample] = quad * e.resolutionHz();
        });
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(table, damping, new TimeGrid(dt, STEPS), probes, SEED, 0,
            SAMPLES, 2), sink, null);
        ensemble = psd.estimate();
        CsdEstimate c = csdAll.estimate();
        ensembleCsd = new double[2][c.size()];
        for (int k = 0; k < c.size(); k++) {
            ensembleCsd[0][k] = c.real(k);
            ensembleCsd[1][k] = c.imaginary(k);
        }
    }

    private static ProbeNoiseModel model(ProbeCoefficients x, ProbeCoefficients y) {
        return ProbeNoiseModel.of(table, damping, x, y);
    }

    private static double z(double alpha) {
        return new NormalDistribution().inverseCumulativeProbability(1 - alpha / 2);
    }

    private static double[] mean(double[] v) {
        double m = 0;
        for (double x : v) {
            m += x;
        }
        m /= v.length;
        double s2 = 0;
        for (double x : v) {
            s2 += (x - m) * (x - m);
        }
        return new double[] {m, Math.sqrt(s2 / (v.length - 1) / v.length)};
    }

    @Test
    void everyBinAgreesWithTheExpectedWelchEstimate() {
        // E[Ĝ_k] from the exact autocovariance of the sampled process, r(τ) = C(τ dt) (PHYSICS.md §5),
        // through WelchPsd.expected (direct lag sum, a different algorithm from the FFT estimator).
        // Ĝ_k/E[Ĝ_k] ~ χ²_ν/ν; Bonferroni over the 257 bins at the family's 2e-7.
        ProbeNoiseModel m = model(dipole, dipole);
        double[] expected = WelchPsd.expected(LEN, dt, tau -> m.correlation(tau * dt));
        double alpha = FAMILY_ALPHA / ensemble.size();
        for (int k = 0; k < ensemble.size(); k++) {
            double nu = ensemble.dof(k);
            ChiSquaredDistribution chi2 = new ChiSquaredDistribution(nu);
            double ratio = ensemble.value(k) / expected[k];
            double lo = chi2.inverseCumulativeProbability(alpha / 2) / nu;
            double hi = chi2.inverseCumulativeProbability(1 - alpha / 2) / nu;
            assertTrue(ratio >= lo && ratio <= hi, "bin " + k + " Ĝ/E = " + ratio + " outside [" + lo + ", " + hi
                + "] (seed " + SEED + ", ν = " + nu + ")");
        }
        // The library's confidence interval is the same χ² statement.
        int k0 = 160;
        double[] ci = ensemble.confidence(k0, 1 - alpha);
        assertTrue(ci[0] <= expected[k0] && expected[k0] <= ci[1], "CI " + ci[0] + ".." + ci[1]);
    }

    @Test
    void linewidthIsOmegaOverQ() {
        // FWHM of the one-sided PSD from its half-power points (linear interpolation between bins).
        // Expected Γ = f0/Q = 16 Δf (PHYSICS.md §5; REFERENCE-VALUES.md §3). Two error sources:
        // (1) bias, deterministic: the Hann window smooths the line over ~1.5 bins, and the mirror term
        // at −f0 and the aliases of the sampled spectrum add a slowly varying background. It is the FWHM
        // of the expected estimate minus Γ; derived bound 1.5 % (about 1.2 % for these settings).
        // (2) noise: with relative errors ε_L, ε_R at the half-power points and ε_p at the peak, all
        // ≤ √(2/ν) and independent (8 bins apart), δΓ/Γ = (ε_L + ε_R − 2ε_p)/2 has SD ≤ √(3/ν).
        ProbeNoiseModel m = model(dipole, dipole);
        double[] expected = WelchPsd.expected(LEN, dt, tau -> m.correlation(tau * dt));
        double gamma = table.frequency(0) / Q;
        double df = ensemble.resolutionHz();
        assertEquals(16.0, gamma / df, 1e-9);
        double bias = fwhm(expected, df) / gamma - 1;
        assertTrue(Math.abs(bias) < 0.015, "resolution bias " + bias);
        double measured = fwhm(ensemble.values(), df);
        double sd = Math.sqrt(3 / ensemble.dof(160));
        double zz = z(FAMILY_ALPHA);
        assertEquals(fwhm(expected, df), measured, zz * sd * gamma,
            "FWHM vs expected estimate (seed " + SEED + ", ν = " + ensemble.dof(160) + ")");
        assertEquals(gamma, measured, (Math.abs(bias) + zz * sd) * gamma, "FWHM vs f0/Q");
    }

    private static double fwhm(double[] g, double df) {
        int p = 0;
        for (int k = 1; k < g.length; k++) {
            if (g[k] > g[p]) {
                p = k;
            }
        }
        double half = g[p] / 2;
        int r = p;
        while (g[r] > half) {
            r++;
        }
        double fr = (r - 1 + (half - g[r - 1]) / (g[r] - g[r - 1])) * df;
        int l = p;
        while (g[l] > half) {
            l--;
        }
        double fl = (l + (half - g[l]) / (g[l + 1] - g[l])) * df;
        return fr - fl;
    }

    @Test
    void integratedPowerIsTheThermalVariance() {
        // Parseval: E[Σ Ĝ Δf] = variance (no detrending). Variance of the dipole signal:
        // (ℓ u_y)² σ_E² coth(ħω/2k_BT) with u_y = 2 at the centre of TE101 (PHYSICS.md §1, §2; N = 2).
        // SE from the spread of the 1024 independent per-sample values.
        double var = Math.pow(0.01 * 2, 2) * table.variance(Field.E, 0);
        assertEquals(var, model(dipole, dipole).covariance(), 1e-9 * var);
        double[] ms = mean(perSamplePower);
        assertEquals(ms[0], ensemble.integratedPower(), 1e-9 * var, "ensemble = mean of per-sample estimates");
        assertEquals(var, ms[0], z(FAMILY_ALPHA) * ms[1], "Σ Ĝ Δf (seed " + SEED + ", SE " + ms[1] + ")");
    }

    @Test
    void crossSpectrumOfDipoleAndLoopIsInQuadrature() {
        // x = ℓ n̂·E couples to e, y = Φ to q: A = 0, B = a b'/ω, so G_xy = iσ²B[L(Ω−ω) − L(Ω+ω)] is
        // imaginary (PHYSICS.md §5 with e = −q̇: q leads e by a quarter period). Band sum of Im Ĝ over
        // f0 ± Γ against the expected estimate from r_xy(τ) = C_xy(−τ dt), SE from per-sample spread;
        // Re Ĝ is zero in expectation.
        ProbeNoiseModel m = model(dipole, loop);
        double[][] expected = WelchCsd.expected(LEN, dt, tau -> m.correlation(-tau * dt));
        double df = ensemble.resolutionHz();
        double quad = 0;
        double re = 0;
        double reExp = 0;
        for (int k = quadLo; k <= quadHi; k++) {
            quad += expected[1][k] * df;
            re += ensembleCsd[0][k] * df;
            reExp += Math.abs(expected[0][k]) * df;
        }
        assertTrue(quad > 0, "Im G_xy > 0 expected: " + quad);
        assertTrue(reExp < 1e-12 * quad, "expected real part " + reExp);
        double[] ms = mean(perSampleQuad);
        double zz = z(FAMILY_ALPHA / 2);
        assertEquals(quad, ms[0], zz * ms[1], "Im band power (seed " + SEED + ", SE " + ms[1] + ")");
        // Re and Im estimates have comparable noise here (|G_xy|² ≪ G_xx G_yy fails only near the peak):
        // bound Re by the same SE.
        assertEquals(0.0, re, zz * ms[1] * 2, "Re band power");
        // The continuous Lorentzian form gives the same band quadrature to the aliasing and resolution
        // level (few %): the sampled spectrum is the model's periodised form.
        double cont = 0;
        for (int k = quadLo; k <= quadHi; k++) {
            cont += m.sampledSpectrum(k * df, dt)[1] * df;
        }
        assertEquals(quad, cont, 0.03 * quad);
    }

    @Test
    void bandPowerGivesBackTheTemperature() {
        // Whole-band power (Parseval) → temperature by inverting P(T) = Σ σ_vac² coth(ħω/2k_BT) (the
        // single mode here): T̂ vs the 0.2 K of the run. SE propagated: δT = δP / (dP/dT),
        // dP/dT = P_vac x/(T sinh²x), x = ħω/2k_BT.
        ProbeNoiseModel m = model(dipole, dipole);
        double[] ms = mean(perSamplePower);
        double tHat = m.bandTemperature(0, Double.POSITIVE_INFINITY, ms[0]);
        double pVac = m.withTemperature(0).covariance();
        double x = PhysicalConstants.HBAR * table.omega(0) / (2 * PhysicalConstants.K_B * TEMPERATURE);
        double dPdT = pVac * x / (TEMPERATURE * Math.pow(Math.sinh(x), 2));
        double seT = ms[1] / dPdT;
        assertEquals(TEMPERATURE, tHat, z(FAMILY_ALPHA) * seT, "T from band power (seed " + SEED + ", SE " + seT + ")");
    }
}
