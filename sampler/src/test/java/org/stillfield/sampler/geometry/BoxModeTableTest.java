package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Window;

/**
 * Per-mode variances of a box mode table against PHYSICS.md §2 (σ_A² = ħ/(2εVω),
 * σ_E² = ħω/(2εV), σ_B² = ħω/(2εVc_m²) = μħω/(2V), times W·coth(ħω/2k_BT)) and the worked TE101
 * values of REFERENCE-VALUES.md §7. Constants are written out here (CODATA 2018, NIST).
 */
class BoxModeTableTest {
    private static final double C = 299_792_458.0;
    private static final double HBAR = 6.62607015e-34 / (2 * Math.PI);
    private static final double KB = 1.380649e-23;
    private static final double EPS0 = 8.8541878128e-12;
    private static final double MU0 = 1.25663706212e-6;

    @Test
    void te101VariancesOfTheThreeByTwoByFourBoxMatchTheReference() {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 7e9, Window.DEFAULT_TOLERANCE),
            ThermalState.VACUUM, 100);
        assertEquals(1, t.size(), "only TE101 below 7 GHz");
        // Derived, see REFERENCE-VALUES.md §7 (7 significant digits: relative 1e-6).
        assertEquals(9.737456e-9, t.variance(Field.E, 0), 1e-6 * 9.737456e-9, "σ_E² of TE101, V²/m²");
        assertEquals(6.323054e-30, t.variance(Field.A, 0), 1e-6 * 6.323054e-30, "σ_A² of TE101, V²s²/m²");
        assertEquals(1.083438e-25, t.variance(Field.B, 0), 1e-6 * 1.083438e-25, "σ_B² of TE101, T²");
        assertEquals(6.245676e9, t.frequency(0), 0.5e3, "f of TE101 (REFERENCE-VALUES.md §3, derived)");
    }

    @Test
    void variancesFollowTheTableFormulasWithFillingWindowAndTemperature() {
        double epsR = 2.25;
        double muR = 1.5;
        double a = 0.03;
        double b = 0.02;
        double d = 0.04;
        double temperature = 0.7;
        double omegaC = 2 * Math.PI * 5e9;
        RectangularCavity box = RectangularCavity.of(a, b, d, new Medium(epsR, muR));
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.EXP, omegaC, 1e-3), new ThermalState(temperature), 10_000);
        assertTrue(t.size() > 20, "modes: " + t.size());
        double v = a * b * d;
        double eps = EPS0 * epsR;
        double mu = MU0 * muR;
        double cm = C / Math.sqrt(epsR * muR);
        for (int l = 0; l < t.size(); l++) {
            double k = t.modes().get(l).k();
            double w = cm * k;
            double weight = Math.exp(-w / omegaC);
            double coth = 1 / Math.tanh(HBAR * w / (2 * KB * temperature));
            String label = t.modes().get(l).label();
            assertEquals(w, t.omega(l), 1e-14 * w, "ω = c_m k of " + label);
            assertEquals(weight, t.weight(l), 1e-14, "W of " + label);
            assertEquals(coth, t.thermalFactor(l), 1e-13 * coth, "coth of " + label);
            double sa = HBAR / (2 * eps * v * w);
            double se = HBAR * w / (2 * eps * v);
            double sb = mu * HBAR * w / (2 * v);
            assertEquals(sa, t.vacuumVariance(Field.A, l), 1e-13 * sa, "σ_A² of " + label);
            assertEquals(se, t.vacuumVariance(Field.E, l), 1e-13 * se, "σ_E² of " + label);
            assertEquals(sb, t.vacuumVariance(Field.B, l), 1e-13 * sb, "σ_B² = μħω/2V of " + label);
            // B = Σ k q h: σ_B² = k²σ_A² (PHYSICS.md §2); equal up to ε0μ0c² − 1 ≈ −4.4e-14
            // (REFERENCE-VALUES.md §1).
            assertEquals(k * k * t.variance(Field.A, l), t.variance(Field.B, l), 1e-12 * t.variance(Field.B, l),
                "σ_B² = k²σ_A² of " + label);
            assertEquals(sb, se / (cm * cm), 1e-12 * sb, "σ_B² = σ_E²/c_m² of " + label);
            assertEquals(weight * coth * se, t.variance(Field.E, l), 1e-13 * t.variance(Field.E, l), "drawn σ_E² of " + label);
            assertEquals(weight * coth * sa, t.variance(Field.A, l), 1e-13 * t.variance(Field.A, l), "drawn σ_A² of " + label);
        }
    }

    @Test
    void vacuumVariancesDescribeAMinimumUncertaintyOscillatorWithZeroPointEnergy() {
        // Each mode is an oscillator of "mass" εV (PHYSICS.md §2). Its ground state has
        // Δq·Δp = ħ/2 with p = εV q̇ = −εV e (minimum uncertainty, textbook) and mean energy
        // (εV/2)(⟨e²⟩ + ω²⟨q²⟩) = ħω/2 (REFERENCE-VALUES.md §7, derived; textbook).
        RectangularCavity box = RectangularCavity.of(0.05, 0.07, 0.11, new Medium(4.0, 1.0));
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 8e9, Window.DEFAULT_TOLERANCE),
            ThermalState.VACUUM, 10_000);
        double eps = EPS0 * 4.0;
        double v = 0.05 * 0.07 * 0.11;
        for (int l = 0; l < t.size(); l++) {
            double dq = Math.sqrt(t.variance(Field.A, l));
            double dp = eps * v * Math.sqrt(t.variance(Field.E, l));
            assertEquals(HBAR / 2, dq * dp, 1e-13 * HBAR, "Δq·Δp of " + t.modes().get(l).label());
            double w = t.omega(l);
            double energy = 0.5 * eps * v * (t.variance(Field.E, l) + w * w * t.variance(Field.A, l));
            assertEquals(HBAR * w / 2, energy, 1e-13 * HBAR * w, "zero-point energy of " + t.modes().get(l).label());
        }
        // hf/2 at 5 GHz = 1.656518e-24 J (REFERENCE-VALUES.md §7, derived).
        assertEquals(1.656518e-24, HBAR * 2 * Math.PI * 5e9 / 2, 0.5e-30);
    }

    @Test
    void tableListsExactlyTheCavityModesUpToTheTruncationFrequency() {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        Window w = new Window(Window.Kind.GAUSS, 2 * Math.PI * 10e9, 1e-6);
        ModeTable t = ModeTable.of(box, w, ThermalState.VACUUM, 100_000);
        assertEquals(box.modesUpTo(w.truncationOmega() / C), t.modes());
        for (int l = 0; l < t.size(); l++) {
            assertTrue(t.omega(l) <= w.truncationOmega(), "ω of mode " + l);
            assertEquals(t.omega(l) / (2 * Math.PI), t.frequency(l), 0.0);
        }
        double[] copy = t.omegas();
        copy[0] = -1;
        assertEquals(C * t.modes().get(0).k(), t.omega(0), 1e-6, "omegas() returns a copy");
    }
}
