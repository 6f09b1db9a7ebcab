package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class NoiseTemperatureTest {
    private static final double W5 = 2 * Math.PI * 5e9;

    @Test
    void quantumLimitIsHalfAQuantum() {
        // T_Q = ħω/(2k_B): Caves, Phys. Rev. D 26, 1817 (1982) (S, abstract); values derived,
        // see REFERENCE-VALUES.md §7: 0.023996 / 0.119981 / 0.239962 K at 1 / 5 / 10 GHz.
        assertEquals(0.023996, NoiseTemperature.quantumLimit(2 * Math.PI * 1e9), 0.5e-6);
        assertEquals(0.119981, NoiseTemperature.quantumLimit(W5), 0.5e-6);
        assertEquals(0.239962, NoiseTemperature.quantumLimit(2 * Math.PI * 10e9), 0.5e-6);
        // At T = 0 only the vacuum half quantum is left.
        assertEquals(NoiseTemperature.quantumLimit(W5), NoiseTemperature.equivalent(W5, 0), 0.0);
        assertEquals(0.0, NoiseTemperature.thermalPart(W5, 0));
    }

    @Test
    void planckOccupationAtFiveGigahertz() {
        // REFERENCE-VALUES.md §7 (derived): n̄ and coth(ħω/2k_BT) = 1 + 2n̄ at 5 GHz.
        double[][] rows = {
            {0.020, 6.155888e-6, 1.000012312, 0.5e-12},
            {0.100, 9.981031e-2, 1.199620615, 0.5e-8},
            {4.2, 17.00752, 35.015041917, 0.5e-5},
            {300, 1249.697, 2500.394428, 0.5e-3}};
        for (double[] r : rows) {
            double n = NoiseTemperature.occupation(W5, r[0]);
            // tolerance: half a unit of the last quoted digit
            assertEquals(r[1], n, r[3], "n̄ at " + r[0] + " K");
            double tq = NoiseTemperature.quantumLimit(W5);
            // T_eq = T_Q coth = T_Q + ħω n̄/k_B: the two parts add up to the symmetrised noise.
            assertEquals(r[2], NoiseTemperature.equivalent(W5, r[0]) / tq, 1e-9 * r[2], "coth at " + r[0] + " K");
            assertEquals(2 * n * tq, NoiseTemperature.thermalPart(W5, r[0]), 1e-12 * n * tq);
            // Inversion: the ratio coth gives the temperature back (the computed ratio: the table's 10
            // digits of coth − 1 = 1.2312e-5 at 20 mK fix T to only ~3e-6).
            double ratio = NoiseTemperature.equivalent(W5, r[0]) / tq;
            assertEquals(r[0], NoiseTemperature.physicalTemperature(W5, ratio), 1e-9 * r[0], "inverse at " + r[0]);
            assertEquals(r[0], NoiseTemperature.physicalTemperature(W5, r[2]), 1e-5 * r[0], "table inverse at " + r[0]);
        }
        // High temperature: T_eq → T + T_Q²/(3T) (expansion of x coth x), 300 K + 1.6e-5 K.
        double tq = NoiseTemperature.quantumLimit(W5);
        assertEquals(300 + tq * tq / 900, NoiseTemperature.equivalent(W5, 300), 1e-9);
    }

    @Test
    void varianceRatiosMapToTemperatures() {
        double tq = NoiseTemperature.quantumLimit(W5);
        assertEquals(tq, NoiseTemperature.fromVarianceRatio(W5, 1), 0.0);
        assertEquals(3 * tq, NoiseTemperature.fromVarianceRatio(W5, 3), 1e-15);
        assertEquals(0.0, NoiseTemperature.physicalTemperature(W5, 1.0));
        assertEquals(0.0, NoiseTemperature.physicalTemperature(W5, 0.98));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> NoiseTemperature.quantumLimit(-1));
        assertEquals("omega must be positive and finite (rad/s): -1.0", ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> NoiseTemperature.occupation(W5, Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> NoiseTemperature.fromVarianceRatio(W5, -2));
    }
}
