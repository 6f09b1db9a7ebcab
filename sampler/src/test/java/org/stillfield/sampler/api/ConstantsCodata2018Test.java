package org.stillfield.sampler.api;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * The constants against the NIST CODATA 2018 table (Tiesinga, Mohr, Newell, Taylor, 2019; the
 * table values are S in REFERENCE-VALUES.md §1). The digits are typed here from that table, not
 * from any library, since newer libraries carry CODATA 2022 (REFERENCE-VALUES.md pitfall 5).
 */
class ConstantsCodata2018Test {
    @Test
    void valuesAreExactlyTheTabulatedOnes() {
        assertEquals("CODATA 2018", PhysicalConstants.SET);
        assertEquals(299792458.0, PhysicalConstants.C, 0.0, "c, m/s (exact)");
        assertEquals(6.62607015e-34, PhysicalConstants.H, 0.0, "h, J s (exact)");
        assertEquals(1.380649e-23, PhysicalConstants.K_B, 0.0, "k_B, J/K (exact)");
        assertEquals(8.8541878128e-12, PhysicalConstants.EPSILON_0, 0.0, "ε0, F/m (CODATA 2018)");
        assertEquals(1.25663706212e-6, PhysicalConstants.MU_0, 0.0, "μ0, N/A² (CODATA 2018)");
    }

    @Test
    void reducedPlanckConstantIsHOverTwoPi() {
        // ħ = 1.054 571 817… e−34 J s; float64 h/(2π) = 1.0545718176461565e−34 (REFERENCE-VALUES.md §1).
        assertEquals(1.0545718176461565e-34, PhysicalConstants.HBAR, 0.0, "ħ in float64");
        // NIST prints the exact ħ truncated, "1.054 571 817…", so it lies in [1.054571817, 1.054571818)e−34.
        assertTrue(PhysicalConstants.HBAR >= 1.054571817e-34 && PhysicalConstants.HBAR < 1.054571818e-34,
            "ħ to the NIST digits: " + PhysicalConstants.HBAR);
        assertEquals(PhysicalConstants.H / (2 * Math.PI), PhysicalConstants.HBAR, 0.0, "ħ = h/2π");
    }

    @Test
    void vacuumConstantsAreConsistentWithTheSpeedOfLight() {
        double c = PhysicalConstants.C;
        // ε0μ0c² = 1 to ~1e-13 for the rounded 2018 pair (REFERENCE-VALUES.md §1: −4.4e−14).
        assertEquals(1.0, PhysicalConstants.EPSILON_0 * PhysicalConstants.MU_0 * c * c, 1e-13, "ε0μ0c²");
        // Z0 = μ0c = 376.730 313 668(57) Ω (NIST CODATA 2018): within its standard uncertainty.
        assertEquals(376.730313668, PhysicalConstants.MU_0 * c, 57e-9, "Z0 = μ0 c, Ω");
        // √(μ0/ε0) = 376.7303136669 (REFERENCE-VALUES.md §1).
        assertEquals(376.7303136669, Math.sqrt(PhysicalConstants.MU_0 / PhysicalConstants.EPSILON_0), 1e-9);
    }

    @Test
    void mediumScalesPermittivityPermeabilityAndWaveSpeed() {
        Medium m = new Medium(2.25, 1.44);
        assertEquals(2.25 * 8.8541878128e-12, m.permittivity(), 1e-27);
        assertEquals(1.44 * 1.25663706212e-6, m.permeability(), 1e-21);
        assertEquals(299792458.0 / 1.8, m.waveSpeed(), 1e-6);
        assertEquals(299792458.0, Medium.VACUUM.waveSpeed(), 0.0);
    }
}
