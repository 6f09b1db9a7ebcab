package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.special.BesselJ;
import org.junit.jupiter.api.Test;

class BesselFunctionsTest {
    /** Size of J_n(x) in the oscillatory region, used to scale absolute errors near zeros. */
    private static double envelope(double ref, double x) {
        return Math.max(Math.abs(ref), Math.min(1.0, Math.sqrt(2 / (Math.PI * x))));
    }

    @Test
    void cylinderValuesMatchCommonsMathBesselJ() {
        // Independent implementation: Commons Math BesselJ (Cody's RJBESL). Over n ≤ 100 and
        // x ∈ [0.01, 250] the two agree to ~3e-15 of the local envelope; 2e-14 leaves margin.
        double worst = 0;
        String where = "";
        double[] t = new double[3];
        for (int n = 0; n <= 100; n += 3) {
            for (double x = 0.01; x < 250; x *= 1.09) {
                double ref = BesselJ.value(n, x);
                BesselFunctions.cylinder(n, x, t);
                double e = Math.abs(t[1] - ref) / envelope(ref, x);
                double refP = BesselJ.value(n + 1, x);
                e = Math.max(e, Math.abs(t[2] - refP) / envelope(refP, x));
                double refM = n == 0 ? -BesselJ.value(1, x) : BesselJ.value(n - 1, x);
                e = Math.max(e, Math.abs(t[0] - refM) / envelope(refM, x));
                if (e > worst) {
                    worst = e;
                    where = "n=" + n + " x=" + x;
                }
            }
        }
        assertTrue(worst < 2e-14, "worst relative deviation from BesselJ " + worst + " at " + where);
    }

    @Test
    void cylinderValuesMatchTabulatedPoints() {
        // A&S Table 9.1 (source from memory for the digits; they agree with BesselJ above).
        assertEquals(0.7651976865579666, BesselFunctions.j(0, 1.0), 2e-16);
        assertEquals(0.4400505857449335, BesselFunctions.j(1, 1.0), 2e-16);
        assertEquals(-0.2459357644513483, BesselFunctions.j(0, 10.0), 3e-16);
    }

    @Test
    void smallArgumentsFollowTheLeadingPowerAndNeverOverflow() {
        // A&S 9.1.7: J_n(x) ~ (x/2)^n/n! as x → 0; relative correction −x²/(4(n+1)) ≈ 1e-19.
        double x = 1e-9;
        assertEquals(1.0, BesselFunctions.j(0, x), 1e-16);
        assertEquals(0.5e-9, BesselFunctions.j(1, x), 1e-25);
        assertEquals(0.125e-18, BesselFunctions.j(2, x), 1e-34);
        // Large order, moderate argument (Miller branch with rescaling): compare with BesselJ.
        for (double arg : new double[] {1.5, 7.0, 40.0}) {
            double ref = BesselJ.value(150, arg);
            double mine = BesselFunctions.j(150, arg);
            assertTrue(Double.isFinite(mine), "J_150(" + arg + ") not finite");
            assertEquals(ref, mine, 1e-13 * Math.abs(ref) + 1e-300, "J_150(" + arg + ")");
        }
    }

    @Test
    void seriesAndRecurrenceBranchesAgreeWhereTheyMeet() {
        // Two different algorithms (series for x ≤ 1, Miller above) must join smoothly: across
        // δ = 1e-12 the value moves by δ·J_n' with J_n' = (J_{n−1} − J_{n+1})/2 (A&S 9.1.27) and
        // j_n' = j_{n−1} − (n+1)j_n/x (A&S 10.1.22); the δ² remainder is 1e-24, so the tolerance is the ~1e-15 rounding each branch accumulates (about 40 recurrence steps).
        double delta = 1e-12;
        double[] a = new double[3];
        double[] b = new double[3];
        double[] sa = new double[4];
        double[] sb = new double[4];
        for (int n = 0; n <= 40; n++) {
            BesselFunctions.cylinder(n, 1.0, a);
            BesselFunctions.cylinder(n, 1.0 + delta, b);
            double predicted = a[1] + delta * 0.5 * (a[0] - a[2]);
            assertEquals(predicted, b[1], 4e-15 * Math.abs(a[1]) + 1e-300, "cylinder n=" + n);
            int ns = Math.max(n, 1);
            BesselFunctions.spherical(ns, 1.0, sa);
            BesselFunctions.spherical(ns, 1.0 + delta, sb);
            double predictedS = sa[1] + delta * (sa[0] - (ns + 1) * sa[3]);
            assertEquals(predictedS, sb[1], 4e-15 * Math.abs(sa[1]) + 1e-300, "spherical n=" + ns);
        }
    }

    @Test
    void sphericalValuesMatchClosedForms() {
        // A&S 10.1.11: j_0 = sin x/x, j_1 = sin x/x² − cos x/x, j_2 = (3/x² − 1) sin x/x − 3 cos x/x².
        // For x ≥ 2 the closed forms lose at most a few ulp; tolerance 1e-14 of the envelope 1/x.
        double[] t = new double[4];
        for (double x = 2.0; x < 300; x *= 1.05) {
            double s = Math.sin(x);
            double c = Math.cos(x);
            BesselFunctions.spherical(1, x, t);
            double scale = 1e-14 / x;
            assertEquals(s / x, t[0], scale, "j_0(" + x + ")");
            assertEquals(s / (x * x) - c / x, t[1], scale, "j_1(" + x + ")");
            assertEquals((3 / (x * x) - 1) * s / x - 3 * c / (x * x), t[2], scale, "j_2(" + x + ")");
            assertEquals(t[1] / x, t[3], 1e-15 * Math.abs(t[3]), "j_1/x at " + x);
        }
    }

    @Test
    void sphericalValuesMatchHalfIntegerBesselJ() {
        // DLMF 10.47.3: j_n(x) = √(π/2x) J_{n+½}(x), with J from Commons Math (independent code).
        double worst = 0;
        String where = "";
        for (int n = 0; n <= 100; n += 3) {
            for (double x = 0.01; x < 250; x *= 1.09) {
                double ref = Math.sqrt(Math.PI / (2 * x)) * BesselJ.value(n + 0.5, x);
                double e = Math.abs(BesselFunctions.sph(n, x) - ref) / Math.max(Math.abs(ref), Math.min(1, 1 / x));
                if (e > worst) {
                    worst = e;
                    where = "n=" + n + " x=" + x;
                }
            }
        }
        assertTrue(worst < 2e-14, "worst relative deviation " + worst + " at " + where);
    }

    @Test
    void sphericalOverXHasItsLimitsAtTheOrigin() {
        // A&S 10.1.2: j_n(x) ≈ x^n/(2n+1)!!, so j_1(x)/x → 1/3 and j_n(x)/x → 0 for n ≥ 2.
        double[] t = new double[4];
        BesselFunctions.spherical(1, 0.0, t);
        assertEquals(0.0, t[1], 0.0);
        assertEquals(1.0 / 3.0, t[3], 1e-16);
        BesselFunctions.spherical(1, 1e-9, t);
        assertEquals(1.0 / 3.0, t[3], 1e-16);
        BesselFunctions.spherical(2, 0.0, t);
        assertEquals(0.0, t[3], 0.0);
        BesselFunctions.spherical(2, 1e-6, t);
        // j_2(x)/x = (x/15)(1 − x²/14 + …), A&S 10.1.2.
        assertEquals(1e-6 / 15 * (1 - 1e-12 / 14), t[3], 1e-22);
    }
}
