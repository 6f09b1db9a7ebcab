package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.univariate.BrentOptimizer;
import org.apache.commons.math3.optim.univariate.SearchInterval;
import org.apache.commons.math3.optim.univariate.UnivariateObjectiveFunction;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.timeseries.LossModel;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.TimeGrid;

class ProbeNoiseModelTest {
    private static final RectangularCavity BOX = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
    private static final Probe PIN = new Probe.ElectricDipole("pin", new Vec3(0.0112, 0.0063, 0.0137),
        new Vec3(0.2, 1, 0.6), 0.004);

    private static ModeTable table(double fGHz, ThermalState state) {
        return ModeTable.of(BOX, new Window(Window.Kind.HARD, 2 * Math.PI * fGHz * 1e9, Window.DEFAULT_TOLERANCE),
            state, 1000);
    }

    private static ProbeNoiseModel auto(ModeTable t, ModeDamping d) {
        ProbeCoefficients c = PIN.coefficients(t);
        return ProbeNoiseModel.of(t, d, c, c);
    }

    /** Composite Simpson rule with n (even) panels: an independent numerical integral. */
    private static double simpson(DoubleUnaryOperator f, double a, double b, int n) {
        double h = (b - a) / n;
        double s = f.applyAsDouble(a) + f.applyAsDouble(b);
        for (int i = 1; i < n; i++) {
            s += (i % 2 == 1 ? 4 : 2) * f.applyAsDouble(a + i * h);
        }
        return s * h / 3;
    }

    @Test
    void mirrorTermWidensTheLineAsInTheReferenceExample() {
        // REFERENCE-VALUES.md §3 (derived): L(ω−ω0) + L(ω+ω0) with κ = 0.3, ω0 = 5 has FWHM 0.30007: the
        // mirror term at −ω0 adds 7e-5 to κ. Same ratio κ/ω0 = 0.06 here (TE101, Q = 5/0.3); the one-sided
        // spectrum in Hz has FWHM 1.00023 κ/2π (0.30007/0.3, ±1.7e-5 from the quoted digits).
        ModeTable t = table(7, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(5 / 0.3));
        ProbeNoiseModel m = auto(t, d);
        double f0 = t.frequency(0);
        double width = d.linewidthHz(0);
        double peakF = new BrentOptimizer(1e-14, 1e-3).optimize(new MaxEval(500), GoalType.MAXIMIZE,
            new UnivariateObjectiveFunction(m::psd), new SearchInterval(f0 - width, f0 + width)).getPoint();
        double half = m.psd(peakF) / 2;
        BrentSolver solver = new BrentSolver(1e-12 * f0);
        // Normalised: the solver's default function-value accuracy is absolute (1e-15).
        double lo = solver.solve(500, f -> m.psd(f) / half - 1, f0 - 3 * width, peakF);
        double hi = solver.solve(500, f -> m.psd(f) / half - 1, peakF, f0 + 3 * width);
        assertEquals(0.30007 / 0.3, (hi - lo) / width, 1.7e-5);
    }

    @Test
    void lorentzianIntegratesToTheVarianceAndTransformsToTheCorrelation() {
        // ∫₀^∞ G df = C(0) and C(τ) = ∫₀^∞ G(f) cos(2πfτ) df (Wiener–Khinchin, one-sided). Numerical
        // Simpson over [0, 40 f_max], step Γ/40; the neglected tail is ≈ 2σ²κ/(π·2π·40 f) ≈ 4e-4 of C(0)
        // for Q = 10, so tolerance 1e-3 of C(0). The closed-form band power (atan) must agree with the
        // numerical integral over finite bands to the quadrature error (1e-9).
        ModeTable t = table(10, new ThermalState(0.4));
        ModeDamping d = ModeDamping.of(t, LossModel.constant(10));
        ProbeNoiseModel m = auto(t, d);
        double c0 = m.covariance();
        ProbeCoefficients c = PIN.coefficients(t);
        double sum = 0;
        for (int l = 0; l < t.size(); l++) {
            sum += c.onE(l) * c.onE(l) * t.variance(Field.E, l);
        }
        assertEquals(sum, c0, 1e-12 * c0, "C(0) = Σ a_l² σ_l²");
        assertEquals(c0, m.bandPower(0, Double.POSITIVE_INFINITY), 1e-12 * c0, "closed-form total");
        double fMax = t.frequency(t.size() - 1);
        double gamma = t.frequency(0) / 10;
        int n = 2 * (int) Math.ceil(40 * fMax / gamma * 40 / 2);
        for (double tau : new double[] {0, 3.1e-11, 1.7e-10}) {
            double num = simpson(f -> m.psd(f) * Math.cos(2 * Math.PI * f * tau), 0, 40 * fMax, n);
            assertEquals(m.correlation(tau), num, 1e-3 * c0, "τ = " + tau);
        }
        double f1 = 0.8 * t.frequency(0);
        double f2 = 1.1 * t.frequency(2);
        assertEquals(simpson(m::psd, f1, f2, 200_000), m.bandPower(f1, f2), 1e-9 * c0);
    }

    @Test
    void sampledSpectrumHoldsTheWholeVarianceBelowNyquist() {
        // The sampled process's spectrum is periodic in f with period 1/Δt and even, so its one-sided
        // integral over [0, f_N] is C(0) exactly (every alias included). For Δt → 0 it tends to the
        // continuous Lorentzians.
        ModeTable t = table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(25));
        ProbeNoiseModel m = auto(t, d);
        double dt = 0.7 / (2 * t.frequency(t.size() - 1));
        double fN = 0.5 / dt;
        double num = simpson(f -> m.sampledSpectrum(f, dt)[0], 0, fN, 400_000);
        assertEquals(m.covariance(), num, 1e-8 * m.covariance());
        double fine = 1e-3 / t.frequency(0);
        for (int l = 0; l < t.size(); l++) {
            double f = t.frequency(l);
            assertEquals(m.psd(f), m.sampledSpectrum(f, fine)[0], 2e-3 * m.psd(f), "mode " + l);
        }
    }

    @Test
    void losslessModesAppearAsLines() {
        ModeTable t = table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.lossless());
        ProbeNoiseModel m = auto(t, d);
        List<ProbeNoiseModel.Line> lines = m.lines();
        ProbeCoefficients c = PIN.coefficients(t);
        double total = 0;
        for (ProbeNoiseModel.Line line : lines) {
            assertEquals(c.onE(line.mode()) * c.onE(line.mode()) * t.variance(Field.E, line.mode()), line.power(),
                1e-12 * line.power());
            assertEquals(0.0, line.quadrature());
            assertEquals(t.frequency(line.mode()), line.frequencyHz());
            total += line.power();
        }
        assertEquals(m.covariance(), total, 1e-12 * total);
        assertEquals(0.0, m.psd(t.frequency(0)));
        ProbeNoiseModel.Line first = lines.get(0);
        assertEquals(first.power(), m.bandPower(first.frequencyHz() * 0.99, first.frequencyHz() * 1.01), 1e-12);
        // Undamped: C(τ) = Σ σ²A cos ωτ, no decay (PHYSICS.md §5).
        double tau = 1e-6;
        double expected = 0;
        for (ProbeNoiseModel.Line line : lines) {
            expected += line.power() * Math.cos(2 * Math.PI * line.frequencyHz() * tau);
        }
        assertEquals(expected, m.correlation(tau), 1e-9 * total);
    }

    @Test
    void aliasedFractionCountsModesAtOrAboveNyquist() {
        ModeTable t = table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(100));
        ProbeNoiseModel m = auto(t, d);
        TimeGrid grid = new TimeGrid(1 / (2 * 8.5e9), 10);
        ProbeCoefficients c = PIN.coefficients(t);
        double all = 0;
        double above = 0;
        for (int l = 0; l < t.size(); l++) {
            double p = c.onE(l) * c.onE(l) * t.variance(Field.E, l);
            all += p;
            above += t.frequency(l) >= 8.5e9 ? p : 0;
        }
        assertEquals(above / all, m.aliasedFraction(grid), 1e-12);
        assertTrue(m.aliasedFraction(grid) > 0.1);
        assertEquals(0.0, m.aliasedFraction(new TimeGrid(1e-12, 10)));
    }

    @Test
    void bandTemperatureInvertsTheThermalBandPower() {
        // Several modes in one band, each with its own coth factor: the Brent inversion must find T back.
        ModeTable t = table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(40));
        ProbeNoiseModel m = auto(t, d);
        double f1 = 7e9;
        double f2 = 10.5e9;
        for (double temp : new double[] {0.05, 0.7, 4.2, 300}) {
            double p = m.withTemperature(temp).bandPower(f1, f2);
            assertEquals(temp, m.bandTemperature(f1, f2, p), 1e-9 * temp, "T = " + temp);
        }
        assertEquals(0.0, m.bandTemperature(f1, f2, 0.5 * m.bandPower(f1, f2)));
        // One mode, symmetric band about it: P_T/P_vac = coth(ħω/2k_BT), so the equivalent temperature
        // is T_Q coth = T_Q + T_P (NoiseTemperature convention).
        ModeTable one = table(7, ThermalState.VACUUM);
        ProbeNoiseModel m1 = auto(one, ModeDamping.of(one, LossModel.constant(1000)));
        double f0 = one.frequency(0);
        double w = f0 / 1000;
        double p = m1.withTemperature(0.1).bandPower(f0 - 20 * w, f0 + 20 * w);
        assertEquals(NoiseTemperature.equivalent(one.omega(0), 0.1), m1.bandEquivalentTemperature(f0 - 20 * w,
            f0 + 20 * w, p), 1e-9);
    }

    @Test
    void rejectsMismatchedInputs() {
        ModeTable t = table(10, ThermalState.VACUUM);
        ModeTable small = table(7, ThermalState.VACUUM);
        ProbeCoefficients c = PIN.coefficients(small);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> ProbeNoiseModel.of(t, ModeDamping.of(t, LossModel.lossless()), c, c));
        assertTrue(ex.getMessage().contains("same"), ex.getMessage());
        ProbeNoiseModel m = auto(t, ModeDamping.of(t, LossModel.lossless()));
        assertThrows(IllegalArgumentException.class, () -> m.bandPower(5, 4));
    }
}
