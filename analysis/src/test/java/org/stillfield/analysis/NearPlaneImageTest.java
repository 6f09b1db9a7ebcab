package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;

/** The image formula near one PEC plane (PHYSICS.md §4, REFERENCE-VALUES.md §6). */
class NearPlaneImageTest {
    private static final double HBAR = PhysicalConstants.HBAR;
    private static final double C = PhysicalConstants.C;
    private static final double EPS0 = PhysicalConstants.EPSILON_0;
    private static final Medium VAC = Medium.VACUUM;

    private static double trace(double[][] m) {
        return m[0][0] + m[1][1] + m[2][2];
    }

    /** Excess over free space at distance z: the image term alone (no subtraction of ~1/a⁴). */
    private static double excessTrace(Field f, double z, double a) {
        Vec3 r = new Vec3(0.4, -0.1, z);
        return trace(AnalyticCorrelation.planeImage(f, 2, 0.0, r, r, a, VAC));
    }

    @Test
    void nearPlaneIsFreeSpacePlusImage() {
        // The split used above: C = C0(r − r′) + image, checked where the subtraction is harmless.
        double a = 0.05;
        Vec3 r = new Vec3(0.1, 0.2, 0.08);
        Vec3 r2 = new Vec3(0.12, 0.17, 0.11);
        for (Field f : Field.values()) {
            double[][] total = AnalyticCorrelation.nearPlane(f, r, r2, a, VAC);
            double[][] free = AnalyticCorrelation.freeSpace(f, r.minus(r2), a, VAC);
            double[][] image = AnalyticCorrelation.planeImage(f, 2, 0.0, r, r2, a, VAC);
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    assertEquals(free[i][j] + image[i][j], total[i][j], 1e-14 * Math.abs(free[0][0]));
                }
            }
        }
    }

    @Test
    void electricExcessTendsToTheCitedLimit() {
        // <E²> − <E²>_free = 3ħc/(16π²ε0z⁴) as a → 0 (Lütken & Ravndal, Phys. Rev. A 31, 2082 (1985);
        // Barton 1970; source from memory). The regulated excess differs by O(a²/z²): a = 1e-4 z
        // gives ~1e-8 relative, tolerance 1e-6.
        for (double z : new double[] {0.01, 0.5, 2.0}) {
            double limit = 3 * HBAR * C / (16 * Math.PI * Math.PI * EPS0 * Math.pow(z, 4));
            assertEquals(limit, excessTrace(Field.E, z, 1e-4 * z), 1e-6 * limit, "z = " + z);
        }
    }

    @Test
    void eachElectricComponentGetsAThird() {
        // ⟨E_x²⟩ = ⟨E_y²⟩ = ⟨E_z²⟩ excess ħc/(16π²ε0z⁴) each: derived, see REFERENCE-VALUES.md §6.
        double z = 0.3;
        double a = 1e-4 * z;
        Vec3 r = new Vec3(0.1, 0.2, z);
        double[][] c = AnalyticCorrelation.planeImage(Field.E, 2, 0.0, r, r, a, VAC);
        double each = HBAR * C / (16 * Math.PI * Math.PI * EPS0 * Math.pow(z, 4));
        for (int i = 0; i < 3; i++) {
            assertEquals(each, c[i][i], 1e-6 * each, "component " + i);
        }
    }

    @Test
    void regulatedElectricExcessMatchesReferenceValue() {
        // z = 1, a = 0.01: 0.01899613887 in units ħc/ε0, from (ħc/2π²ε0)(6Z² − 2a²)/(Z² + a²)³, Z = 2z;
        // derived, see REFERENCE-VALUES.md §6. Tolerance: the value's 10 digits.
        double v = excessTrace(Field.E, 1.0, 0.01) / (HBAR * C / EPS0);
        assertEquals(0.01899613887, v, 1e-9 * 0.019);
    }

    @Test
    void electricExcessEqualsAnIndependentHalfSpaceModeIntegral() {
        // Half-space modes instead of images: the polarisation sum of |u|² is 2 − 2(k_z²/k²)cos(2k_z z),
        // so the excess is (ħc/2ε0)∫d³k/(2π)³ k e^{−ak}·(−2 k_z²/k²)cos(2k_z z)
        // = −(ħc/2ε0)(8π/(2π)³)∫k³e^{−ak}[j0(x) − 2j1(x)/x]dk, x = 2kz (angular integral by hand).
        // Derived, see REFERENCE-VALUES.md §6 (agrees with the images to 10 digits there).
        // Quadrature: 32-point Gauss–Legendre on 400 panels of [0, 60/a]; tolerance 1e-9 relative.
        for (double[] za : new double[][] {{1.0, 0.3}, {0.2, 0.1}, {0.05, 0.1}}) {
            double z = za[0];
            double a = za[1];
            double integral = FreeSpaceClosedFormTest.radial(k -> {
                double x = 2 * k * z;
                return k * k * k * Math.exp(-a * k) * (FreeSpaceClosedFormTest.j0(x) - 2 * FreeSpaceClosedFormTest.j1OverX(x));
            }, 60 / a);
            double expected = -(HBAR * C / (2 * EPS0)) * 8 * Math.PI / Math.pow(2 * Math.PI, 3) * integral;
            double scale = HBAR * C / (EPS0 * Math.pow(a, 4));
            assertEquals(expected, excessTrace(Field.E, z, a), 1e-9 * scale, "z = " + z + ", a = " + a);
        }
    }

    @Test
    void magneticExcessTendsToTheCitedLimit() {
        // <B²> − <B²>_free = −3ħ/(16π²ε0cz⁴) (same sources as E, source from memory).
        double z = 0.25;
        double limit = -3 * HBAR / (16 * Math.PI * Math.PI * EPS0 * C * Math.pow(z, 4));
        assertEquals(limit, excessTrace(Field.B, z, 1e-4 * z), 1e-6 * Math.abs(limit));
    }

    @Test
    void energyDensityExcessVanishesNearOnePlate() {
        // (ε0⟨E²⟩ + ⟨B²⟩/μ0)/2 has no excess near one plate, for any a (derived, see
        // REFERENCE-VALUES.md §6 and pitfall 8; Lütken & Ravndal 1985, source from memory). With the
        // CODATA 2018 pair ε0μ0c² = 1 − 4e-14, so the residual is ~1e-13 of either term.
        for (double[] za : new double[][] {{0.1, 0.01}, {0.02, 0.03}, {1.0, 1e-4}}) {
            double de = EPS0 * excessTrace(Field.E, za[0], za[1]) / 2;
            double db = excessTrace(Field.B, za[0], za[1]) / (2 * PhysicalConstants.MU_0);
            assertEquals(0.0, de + db, 1e-12 * Math.abs(de), "z = " + za[0] + ", a = " + za[1]);
        }
    }

    @Test
    void wallConditionsHold() {
        // On the plane: tangential E and normal B vanish (n×E = 0, n·B = 0, PHYSICS.md §1), for
        // every second point. Exact: the image cancels the direct term component by component.
        double a = 0.05;
        Vec3 onWall = new Vec3(0.1, 0.2, 0.0);
        Vec3 other = new Vec3(0.15, 0.1, 0.07);
        double[][] e = AnalyticCorrelation.nearPlane(Field.E, onWall, other, a, VAC);
        double[][] b = AnalyticCorrelation.nearPlane(Field.B, onWall, other, a, VAC);
        double[][] aa = AnalyticCorrelation.nearPlane(Field.A, onWall, other, a, VAC);
        for (int j = 0; j < 3; j++) {
            assertEquals(0.0, e[0][j]);
            assertEquals(0.0, e[1][j]);
            assertEquals(0.0, aa[0][j]);
            assertEquals(0.0, aa[1][j]);
            assertEquals(0.0, b[2][j]);
        }
    }

    @Test
    void anyWallIsTheZPlaneAfterACoordinateMap() {
        // The wall x = w with the box on x < w is the plane z = 0 after the map
        // (x, y, z) → (y, z, w − x) (a rotation with a reflection, so the pseudovector B picks up a sign
        // under the reflection; its correlation tensor, quadratic in B, does not). Components permute
        // accordingly: new (x, y, z) = old (y, z, −x). Consistency of the general form; tolerance rounding.
        double a = 0.03;
        double w = 0.5;
        Vec3 r = new Vec3(0.42, 0.1, -0.2);
        Vec3 r2 = new Vec3(0.47, 0.13, -0.25);
        for (Field f : Field.values()) {
            double[][] general = AnalyticCorrelation.nearPlane(f, 0, w, r, r2, a, VAC);
            double[][] mapped = AnalyticCorrelation.nearPlane(f, map(r, w), map(r2, w), a, VAC);
            int[] oldOf = {1, 2, 0};
            double[] sign = {1, 1, -1};
            double scale = Math.abs(general[0][0]);
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    double expected = sign[i] * sign[j] * general[oldOf[i]][oldOf[j]];
                    assertEquals(expected, mapped[i][j], 1e-12 * scale, f + "[" + i + "][" + j + "]");
                }
            }
        }
    }

    private static Vec3 map(Vec3 r, double w) {
        return new Vec3(r.y(), r.z(), w - r.x());
    }

    @Test
    void rejectsPointsOnOppositeSides() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> AnalyticCorrelation.nearPlane(
            Field.E, new Vec3(0, 0, 1), new Vec3(0, 0, -1), 0.1, VAC));
        org.junit.jupiter.api.Assertions.assertTrue(ex.getMessage().contains("same side"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> AnalyticCorrelation.nearPlane(
            Field.E, 3, 0, new Vec3(0, 0, 1), new Vec3(0, 0, 1), 0.1, VAC));
    }
}
