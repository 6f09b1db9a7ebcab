package org.stillfield.sampler.api;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * Spectral windows (PHYSICS.md §3): weights, truncation, the neglected fraction checked against
 * an independent numerical integral, and the mode table's refusals of unusable cutoffs.
 */
class WindowTest {
    private static final double OMEGA_C = 2 * Math.PI * 10e9;

    @Test
    void weightsAtTheCutoffFrequency() {
        // Definitions of PHYSICS.md §3: W(ω_c) = 1 (hard), e^{−1} (exp), e^{−1} (Gaussian).
        assertEquals(1.0, new Window(Window.Kind.HARD, OMEGA_C, 1e-9).weight(OMEGA_C), 0.0);
        assertEquals(Math.exp(-1), new Window(Window.Kind.EXP, OMEGA_C, 1e-9).weight(OMEGA_C), 1e-16);
        assertEquals(Math.exp(-1), new Window(Window.Kind.GAUSS, OMEGA_C, 1e-9).weight(OMEGA_C), 1e-16);
        assertEquals(Math.exp(-0.25), new Window(Window.Kind.GAUSS, OMEGA_C, 1e-9).weight(OMEGA_C / 2), 1e-16);
        assertEquals(Math.exp(-2), new Window(Window.Kind.EXP, OMEGA_C, 1e-9).weight(2 * OMEGA_C), 1e-16);
        for (Window.Kind k : Window.Kind.values()) {
            Window w = new Window(k, OMEGA_C, 1e-6);
            assertEquals(1.0, w.weight(0), 0.0, k + " at ω = 0");
            assertEquals(0.0, w.weight(w.truncationOmega() * (1 + 1e-12)), 0.0, k + " above truncation");
        }
        assertEquals(0.0, new Window(Window.Kind.HARD, OMEGA_C, 1e-9).weight(OMEGA_C * 1.000001), 0.0, "hard above ω_c");
    }

    @Test
    void smoothWindowsAreTruncatedWhereTheWeightFallsToTheTolerance() {
        for (double tol : new double[] {1e-3, 1e-9, 1e-15}) {
            Window exp = new Window(Window.Kind.EXP, OMEGA_C, tol);
            Window gauss = new Window(Window.Kind.GAUSS, OMEGA_C, tol);
            assertEquals(OMEGA_C * Math.log(1 / tol), exp.truncationOmega(), 1e-12 * exp.truncationOmega(), "exp, tol " + tol);
            assertEquals(OMEGA_C * Math.sqrt(Math.log(1 / tol)), gauss.truncationOmega(), 1e-12 * gauss.truncationOmega(),
                "gauss, tol " + tol);
            // Definition check: W at the truncation frequency equals the tolerance.
            assertEquals(tol, exp.weight(exp.truncationOmega()), 1e-12 * tol, "W_exp(ω_trunc), tol " + tol);
            assertEquals(tol, gauss.weight(gauss.truncationOmega()), 1e-12 * tol, "W_gauss(ω_trunc), tol " + tol);
        }
        assertEquals(OMEGA_C, new Window(Window.Kind.HARD, OMEGA_C, 1e-9).truncationOmega(), 0.0);
    }

    /** ∫ t^p W(t) dt over [x, x + 120] (the rest is below 1e-40 relative) by adaptive Gauss–Legendre. */
    private static double tail(UnivariateFunction f, double x) {
        IterativeLegendreGaussIntegrator gl = new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-300);
        double sum = 0;
        for (int i = 0; i < 12; i++) {
            sum += gl.integrate(100_000, f, x + 10 * i, x + 10 * (i + 1));
        }
        return sum;
    }

    @Test
    void neglectedFractionMatchesAnIndependentQuadrature() {
        // Fraction of ∫₀^∞ ω^p W(ω) dω above ω_trunc, in t = ω/ω_c; both integrals by Commons Math
        // Gauss–Legendre quadrature here, not through the incomplete gamma function.
        for (double tol : new double[] {1e-3, 1e-6, 1e-9}) {
            for (int p : new int[] {1, 3}) {
                final int pp = p;
                Window exp = new Window(Window.Kind.EXP, OMEGA_C, tol);
                UnivariateFunction fe = t -> Math.pow(t, pp) * Math.exp(-t);
                double ex = tail(fe, exp.truncationOmega() / OMEGA_C) / tail(fe, 0);
                assertEquals(ex, exp.neglectedFraction(p), 1e-9 * ex, "exp, p = " + p + ", tol " + tol);
                Window gauss = new Window(Window.Kind.GAUSS, OMEGA_C, tol);
                UnivariateFunction fg = t -> Math.pow(t, pp) * Math.exp(-t * t);
                double gx = tail(fg, gauss.truncationOmega() / OMEGA_C) / tail(fg, 0);
                assertEquals(gx, gauss.neglectedFraction(p), 1e-9 * gx, "gauss, p = " + p + ", tol " + tol);
            }
        }
        // Closed form for p = 3: ∫_x^∞ t³e^{−t} dt / Γ(4) = e^{−x}(1 + x + x²/2 + x³/6)
        // (incomplete gamma function of integer order; Abramowitz & Stegun 6.5.13, source from
        // memory). At tol = 1e-9, x = 9 ln 10.
        Window exp = new Window(Window.Kind.EXP, OMEGA_C, 1e-9);
        double x = 9 * Math.log(10);
        double closed = Math.exp(-x) * (1 + x + x * x / 2 + x * x * x / 6);
        assertEquals(closed, exp.neglectedFraction(3), 1e-12 * closed);
        assertEquals(exp.neglectedFraction(3), exp.neglectedFraction(Field.E), 0.0, "E weighs modes as ω³");
        assertEquals(exp.neglectedFraction(3), exp.neglectedFraction(Field.B), 0.0, "B weighs modes as ω³");
        assertEquals(exp.neglectedFraction(1), exp.neglectedFraction(Field.A), 0.0, "A weighs modes as ω");
        assertEquals(0.0, new Window(Window.Kind.HARD, OMEGA_C, 1e-9).neglectedFraction(3), 0.0);
    }

    @Test
    void rejectsBadParametersSayingWhatIsAllowed() {
        for (double w : new double[] {0, -1, Double.NaN, Double.POSITIVE_INFINITY}) {
            IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
                () -> new Window(Window.Kind.EXP, w, 1e-9));
            assertTrue(ex.getMessage().contains("cutoff") && ex.getMessage().contains("positive and finite")
                && ex.getMessage().contains(String.valueOf(w)), ex.getMessage());
        }
        for (double t : new double[] {0, 0.5, -1e-3, Double.NaN}) {
            IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
                () -> new Window(Window.Kind.GAUSS, OMEGA_C, t));
            assertTrue(ex.getMessage().contains("tolerance") && ex.getMessage().contains("(0, 0.5)"), ex.getMessage());
        }
        assertThrows(IllegalArgumentException.class, () -> new Window(null, OMEGA_C, 1e-9));
    }

    @Test
    void modeTableRefusesACutoffBelowTheLowestMode() {
        // TE101 of the 3×2×4 cm box is at 6.245676 GHz (REFERENCE-VALUES.md §3, derived).
        Cavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> ModeTable.of(box,
            new Window(Window.Kind.HARD, 2 * Math.PI * 6.2e9, 1e-9), ThermalState.VACUUM, 1000));
        assertTrue(ex.getMessage().contains("window.cutoff") && ex.getMessage().contains("6.24568e+09"), ex.getMessage());
        // Just above the lowest mode the table holds exactly that mode.
        assertEquals(1, ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 6.25e9, 1e-9), ThermalState.VACUUM,
            1000).size());
        // A smooth window whose ω_c is below the lowest mode but whose truncation is above is usable.
        assertTrue(ModeTable.of(box, new Window(Window.Kind.EXP, 2 * Math.PI * 3e9, 1e-3), ThermalState.VACUUM, 1000)
            .size() > 0);
        // Filling lowers the mode frequencies: 6.2 GHz does reach TE101 (6.245676/1.5 GHz) at ε_r = 2.25.
        Cavity filled = RectangularCavity.of(0.03, 0.02, 0.04, new Medium(2.25, 1));
        assertTrue(ModeTable.of(filled, new Window(Window.Kind.HARD, 2 * Math.PI * 6.2e9, 1e-9), ThermalState.VACUUM, 1000)
            .size() > 0);
    }

    @Test
    void modeTableRefusesACutoffWhoseWeylEstimateExceedsMaxModes() {
        Cavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        Window w = new Window(Window.Kind.HARD, 2 * Math.PI * 60e9, 1e-9);
        double estimate = box.weylCount(w.truncationOmega() / PhysicalConstants.C);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> ModeTable.of(box, w, ThermalState.VACUUM, (long) estimate - 1));
        assertTrue(ex.getMessage().contains("limits.max_modes") && ex.getMessage().contains("window.cutoff")
            && ex.getMessage().contains(String.valueOf((long) estimate - 1)), ex.getMessage());
        ModeTable t = ModeTable.of(box, w, ThermalState.VACUUM, (long) estimate + 1);
        // Weyl with the edge term is close to the true count (REFERENCE-VALUES.md §4): within 5 %.
        assertEquals(estimate, t.size(), 0.05 * estimate, "Weyl estimate vs enumerated count");
    }
}
