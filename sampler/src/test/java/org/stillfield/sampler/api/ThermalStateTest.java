package org.stillfield.sampler.api;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Thermal variance factor coth(ħω/2k_BT) = 1 + 2n̄ and Planck occupation n̄ = 1/(e^{ħω/k_BT} − 1)
 * (textbook; PHYSICS.md §2) against the 5 GHz values of REFERENCE-VALUES.md §7 (derived there).
 */
class ThermalStateTest {
    private static final double OMEGA_5GHZ = 2 * Math.PI * 5e9;

    @Test
    void fiveGigahertzOccupationAndFactorMatchTheReference() {
        // {T in K, n̄, coth}; derived, see REFERENCE-VALUES.md §7. Tolerances: half a unit in the
        // last quoted digit of each value.
        double[][] rows = {
            {0.020, 6.155888e-6, 0.5e-12, 1.000012312, 0.5e-9},
            {0.100, 9.981031e-2, 0.5e-8, 1.199620615, 0.5e-9},
            {4.2, 17.00752, 0.5e-5, 35.015041917, 0.5e-9},
            {300, 1249.697, 0.5e-3, 2500.394428, 0.5e-6},
        };
        for (double[] r : rows) {
            ThermalState s = new ThermalState(r[0]);
            assertEquals(r[1], s.occupation(OMEGA_5GHZ), r[2], "n̄ at 5 GHz, T = " + r[0] + " K");
            assertEquals(r[3], s.varianceFactor(OMEGA_5GHZ), r[4], "coth at 5 GHz, T = " + r[0] + " K");
            assertEquals(1 + 2 * s.occupation(OMEGA_5GHZ), s.varianceFactor(OMEGA_5GHZ),
                1e-14 * s.varianceFactor(OMEGA_5GHZ), "coth = 1 + 2n̄ at T = " + r[0] + " K");
        }
    }

    @Test
    void factorIsContinuousAcrossTheLargeArgumentBranch() {
        // x = ħω/2k_BT; the code switches to 1 + 2e^{−2x} above x = 20. Compare both sides with
        // 1 + 2n̄ from expm1 (a different formula), and with the classical limit 2k_BT/ħω at small x.
        double kb = 1.380649e-23;
        double hbar = 6.62607015e-34 / (2 * Math.PI);
        double t = 0.01;
        for (double x : new double[] {0.5, 5, 19.999, 20.001, 30, 400}) {
            double omega = x * 2 * kb * t / hbar;
            ThermalState s = new ThermalState(t);
            double viaOccupation = 1 + 2 / Math.expm1(2 * x);
            assertEquals(viaOccupation, s.varianceFactor(omega), 1e-15 * viaOccupation, "coth at x = " + x);
            assertTrue(s.varianceFactor(omega) >= 1.0, "coth ≥ 1 at x = " + x);
        }
        ThermalState hot = new ThermalState(1e4);
        double x = hbar * 1e6 / (2 * kb * 1e4);
        assertEquals(1 / x, hot.varianceFactor(1e6), 1e-6 / x, "classical limit coth x ≈ 1/x");
    }

    @Test
    void vacuumHasFactorOneAndNoOccupation() {
        assertTrue(ThermalState.VACUUM.isVacuum());
        assertEquals(1.0, ThermalState.VACUUM.varianceFactor(OMEGA_5GHZ), 0.0);
        assertEquals(0.0, ThermalState.VACUUM.occupation(OMEGA_5GHZ), 0.0);
        // A very cold state approaches the vacuum continuously: coth − 1 = 2e^{−2x} underflows to 0.
        assertEquals(1.0, new ThermalState(1e-6).varianceFactor(OMEGA_5GHZ), 0.0);
    }

    @Test
    void rejectsNegativeNanAndInfiniteTemperaturesNamingTheSetting() {
        for (double t : new double[] {-1e-3, Double.NaN, Double.POSITIVE_INFINITY}) {
            IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> new ThermalState(t));
            assertTrue(ex.getMessage().contains("state.temperature_K") && ex.getMessage().contains(">= 0")
                && ex.getMessage().contains(String.valueOf(t)), ex.getMessage());
        }
    }
}
