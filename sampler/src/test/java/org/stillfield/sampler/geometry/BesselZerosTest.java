package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.stillfield.sampler.geometry.BesselZeros.Kind;

class BesselZerosTest {
    /** Two units in the last place of values in [1, 16): the root is limited by J's own rounding. */
    private static final double ULP2 = 4.5e-15;

    private static double zero(Kind kind, int n, int s) {
        return BesselZeros.first(kind, n, s)[s - 1];
    }

    @Test
    void zerosOfJnMatchReferenceValues() {
        // A&S Table 9.5 (10 decimals for n = 0, 5 for n ≥ 1); the 16-digit values are
        // mpmath.besseljzero, derived, see REFERENCE-VALUES.md §2a.
        assertEquals(2.404825557695773, zero(Kind.J, 0, 1), ULP2);
        assertEquals(5.520078110286311, zero(Kind.J, 0, 2), ULP2);
        assertEquals(8.653727912911012, zero(Kind.J, 0, 3), 2 * ULP2);
        assertEquals(3.831705970207512, zero(Kind.J, 1, 1), ULP2);
        assertEquals(7.015586669815619, zero(Kind.J, 1, 2), ULP2);
        assertEquals(5.135622301840683, zero(Kind.J, 2, 1), ULP2);
        assertEquals(6.380161895923984, zero(Kind.J, 3, 1), ULP2);
        // The A&S precision itself, as that table would be cited.
        assertEquals(2.4048255577, zero(Kind.J, 0, 1), 1e-10);
        assertEquals(3.83171, zero(Kind.J, 1, 1), 1e-5);
    }

    @Test
    void zerosOfJnPrimeMatchReferenceValues() {
        // A&S Table 9.5; 16 digits from mpmath, derived, see REFERENCE-VALUES.md §2a.
        assertEquals(1.841183781340659, zero(Kind.J_PRIME, 1, 1), ULP2);
        assertEquals(5.331442773525033, zero(Kind.J_PRIME, 1, 2), 2 * ULP2);
        assertEquals(3.054236928227140, zero(Kind.J_PRIME, 2, 1), ULP2);
        assertEquals(4.201188941210528, zero(Kind.J_PRIME, 3, 1), ULP2);
        assertEquals(1.84118, zero(Kind.J_PRIME, 1, 1), 1e-5);
    }

    @Test
    void firstDerivativeZeroOfJ0UsesTheEngineeringConvention() {
        // REFERENCE-VALUES.md pitfall 4: TE_0mp uses 3.8317…, 7.0156… (x = 0 is not counted), and
        // x'_0m = x_1m exactly because J_0' = −J_1 (A&S 9.1.28).
        double[] te0 = BesselZeros.first(Kind.J_PRIME, 0, 4);
        assertArrayEquals(BesselZeros.first(Kind.J, 1, 4), te0, 0.0);
        assertEquals(3.831705970207512, te0[0], ULP2);
        assertEquals(7.015586669815619, te0[1], ULP2);
    }

    @Test
    void sphericalZerosMatchReferenceValues() {
        // Zeros of j_n = zeros of J_{n+½} (DLMF §10.58); values mpmath.besseljzero(n+½, m), derived,
        // see REFERENCE-VALUES.md §2b (the A&S Table 10.6 attribution is from memory).
        assertEquals(4.493409457909064, zero(Kind.SPHERICAL_J, 1, 1), ULP2);
        assertEquals(7.725251836937707, zero(Kind.SPHERICAL_J, 1, 2), ULP2);
        assertEquals(10.90412165942890, zero(Kind.SPHERICAL_J, 1, 3), 4 * ULP2);
        assertEquals(5.763459196894550, zero(Kind.SPHERICAL_J, 2, 1), ULP2);
        assertEquals(6.987932000500520, zero(Kind.SPHERICAL_J, 3, 1), ULP2);
        assertEquals(8.182561452571243, zero(Kind.SPHERICAL_J, 4, 1), 2 * ULP2);
        assertEquals(15.03966470761652, zero(Kind.SPHERICAL_J, 4, 3), 4 * ULP2);
        // Zeros of [x j_n]': scipy brentq, derived, see REFERENCE-VALUES.md §2c (12 decimals given).
        assertEquals(2.743707269992, zero(Kind.SPHERICAL_RICCATI_PRIME, 1, 1), 1e-12);
        assertEquals(6.116764264462, zero(Kind.SPHERICAL_RICCATI_PRIME, 1, 2), 1e-12);
        assertEquals(9.316615628566, zero(Kind.SPHERICAL_RICCATI_PRIME, 1, 3), 1e-12);
        assertEquals(3.870238580222, zero(Kind.SPHERICAL_RICCATI_PRIME, 2, 1), 1e-12);
        assertEquals(4.973420350823, zero(Kind.SPHERICAL_RICCATI_PRIME, 3, 1), 1e-12);
        assertEquals(14.670116776572, zero(Kind.SPHERICAL_RICCATI_PRIME, 5, 3), 1e-12);
    }

    @Test
    void lowestSphereTmZeroSolvesItsClosedForm() {
        // [x j_1]' = 0 ⇔ tan x = x/(1 − x²) (REFERENCE-VALUES.md §2c cross-check, derived from A&S 10.1.11).
        double x = zero(Kind.SPHERICAL_RICCATI_PRIME, 1, 1);
        assertEquals(0.0, Math.tan(x) - x / (1 - x * x), 1e-14);
    }

    @Test
    void zerosInterlaceAsTheTheoremRequires() {
        // DLMF §10.21(i) (source from memory): n ≤ j'_{n,1} < j_{n,1} < j'_{n,2} < j_{n,2} < …
        // and j_{n,s} < j_{n+1,s} < j_{n,s+1}. A missed or doubled zero breaks one of these.
        int count = 25;
        for (int n = 1; n <= 40; n++) {
            double[] j = BesselZeros.first(Kind.J, n, count);
            double[] jp = BesselZeros.first(Kind.J_PRIME, n, count);
            double[] jNext = BesselZeros.first(Kind.J, n + 1, count);
            assertTrue(jp[0] >= n, "j'_{" + n + ",1} = " + jp[0] + " below n");
            for (int s = 0; s < count; s++) {
                assertTrue(jp[s] < j[s], "j'_{" + n + "," + (s + 1) + "} >= j_{" + n + "," + (s + 1) + "}");
                if (s + 1 < count) {
                    assertTrue(j[s] < jp[s + 1], "j_{" + n + "," + (s + 1) + "} >= j'_{" + n + "," + (s + 2) + "}");
                    assertTrue(j[s] < jNext[s] && jNext[s] < j[s + 1], "j_{n+1,s} not between j_{n,s} and j_{n,s+1}, n="
                        + n + " s=" + (s + 1));
                }
            }
        }
    }

    @Test
    void farZerosFollowMcMahonsExpansion() {
        // A&S 9.5.12 (source from memory): j_{n,s} ≈ β − (μ−1)/(8β) − 4(μ−1)(7μ−31)/(3(8β)³),
        // β = (s + n/2 − ¼)π, μ = 4n²; the next term is O(β⁻⁵) ≈ 1e-11 at s = 60 for n ≤ 3.
        for (int n = 0; n <= 3; n++) {
            double[] z = BesselZeros.first(Kind.J, n, 60);
            double beta = (60 + n / 2.0 - 0.25) * Math.PI;
            double mu = 4.0 * n * n;
            double mcMahon = beta - (mu - 1) / (8 * beta) - 4 * (mu - 1) * (7 * mu - 31) / (3 * Math.pow(8 * beta, 3));
            assertEquals(mcMahon, z[59], 1e-9, "j_{" + n + ",60}");
        }
    }

    @Test
    void upToStopsAtTheLimit() {
        // Zeros of J_0 below 9 are the three listed in REFERENCE-VALUES.md §2a.
        assertEquals(3, BesselZeros.upTo(Kind.J, 0, 9.0).length);
        assertEquals(0, BesselZeros.upTo(Kind.J, 5, 5.0).length);
    }

    @Test
    void rejectsNegativeOrder() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> BesselZeros.upTo(Kind.J, -1, 10));
        assertTrue(e.getMessage().contains("n must be >= 0"), e.getMessage());
    }
}
