package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/** Free-space closed forms (PHYSICS.md §4, REFERENCE-VALUES.md §5) against tables, quadrature and limits. */
class FreeSpaceClosedFormTest {
    private static final double HBAR = PhysicalConstants.HBAR;
    private static final double C = PhysicalConstants.C;
    private static final double EPS0 = PhysicalConstants.EPSILON_0;
    private static final Medium VAC = Medium.VACUUM;
    /** Unit of the A table, ħ/(2ε0c). */
    private static final double UNIT_A = HBAR / (2 * EPS0 * C);
    /** Unit of the E values, ħc/ε0. */
    private static final double UNIT_E = HBAR * C / EPS0;

    @Test
    void vectorPotentialMatchesReferenceTable() {
        // Coulomb-gauge C^A parallel and perpendicular at r = 1 m, units ħ/(2ε0c): derived, see
        // REFERENCE-VALUES.md §5 (mpmath quadrature = closed form, 10 digits). Tolerance 1e-9
        // relative: the table's 10 significant digits.
        double[][] table = {
            {0.3, 0.06243392493, 0.01526064471},
            {0.1, 0.08641554392, 0.006951229844},
            {0.03, 0.09663769707, 0.00229618975},
        };
        for (double[] row : table) {
            double a = row[0];
            double par = AnalyticCorrelation.freeSpaceParallel(Field.A, 1.0, a, VAC) / UNIT_A;
            double perp = AnalyticCorrelation.freeSpacePerpendicular(Field.A, 1.0, a, VAC) / UNIT_A;
            assertEquals(row[1], par, 1e-9 * row[1], "A parallel at a = " + a);
            assertEquals(row[2], perp, 1e-9 * row[2], "A perpendicular at a = " + a);
        }
    }

    @Test
    void electricFieldMatchesReferenceValues() {
        // r = 1 m, a = 0.1 m, units ħc/ε0: par 0.09932475605, perp −0.09735792919; derived, see
        // REFERENCE-VALUES.md §5 (quadrature = closed form to 10 digits).
        double par = AnalyticCorrelation.freeSpaceParallel(Field.E, 1.0, 0.1, VAC) / UNIT_E;
        double perp = AnalyticCorrelation.freeSpacePerpendicular(Field.E, 1.0, 0.1, VAC) / UNIT_E;
        assertEquals(0.09932475605, par, 1e-9 * 0.0994);
        assertEquals(-0.09735792919, perp, 1e-9 * 0.0974);
    }

    @Test
    void closedFormsMatchRadialQuadratureOnBothSidesOfTheSeriesSwitch() {
        // Independent numerics: C = ∫d³k/(2π)³ f(k)(δ − k̂k̂)e^{−ak}e^{ik·r} with the angular
        // integrals done by hand, ∫dΩ(1 − μ²)e^{ixμ} = 8π j1(x)/x (parallel) and
        // ∫dΩ(1 − sin²θcos²φ)e^{ixμ} = 4π(j0 − j1/x) (perpendicular), x = kr; the radial integral by
        // 32-point Gauss–Legendre on 400 panels of [0, 60/a]. f = ħc k/(2ε0) for E, ħ/(2ε0ck) for A.
        // r/a from 0.2 to 3 covers the series branch of g (r/a < 0.5) and the closed branch.
        double a = 0.3;
        for (double r : new double[] {0.06, 0.149, 0.151, 0.3, 0.9}) {
            final double rr = r;
            double parA = radial(k -> UNIT_A * k * Math.exp(-a * k) * 2 * j1OverX(k * rr), 60 / a) / (2 * Math.PI * Math.PI);
            double perpA = radial(k -> UNIT_A * k * Math.exp(-a * k) * (j0(k * rr) - j1OverX(k * rr)), 60 / a)
                / (2 * Math.PI * Math.PI);
            double parE = radial(k -> HBAR * C / (2 * EPS0) * k * k * k * Math.exp(-a * k) * 2 * j1OverX(k * rr), 60 / a)
                / (2 * Math.PI * Math.PI);
            double perpE = radial(k -> HBAR * C / (2 * EPS0) * k * k * k * Math.exp(-a * k) * (j0(k * rr) - j1OverX(k * rr)),
                60 / a) / (2 * Math.PI * Math.PI);
            double scaleA = Math.abs(parA);
            double scaleE = Math.abs(parE);
            assertEquals(parA, AnalyticCorrelation.freeSpaceParallel(Field.A, r, a, VAC), 1e-10 * scaleA, "A par r = " + r);
            assertEquals(perpA, AnalyticCorrelation.freeSpacePerpendicular(Field.A, r, a, VAC), 1e-10 * scaleA, "A perp r = " + r);
            assertEquals(parE, AnalyticCorrelation.freeSpaceParallel(Field.E, r, a, VAC), 1e-10 * scaleE, "E par r = " + r);
            assertEquals(perpE, AnalyticCorrelation.freeSpacePerpendicular(Field.E, r, a, VAC), 1e-10 * scaleE, "E perp r = " + r);
        }
    }

    @Test
    void valuesAtZeroSeparation() {
        // C^E(0) = ħcδ/(π²ε0a⁴) and C^A(0) = ħδ/(6π²ε0ca²): derived, see REFERENCE-VALUES.md §5.
        double a = 0.02;
        double[][] e = AnalyticCorrelation.freeSpace(Field.E, Vec3.ZERO, a, VAC);
        double[][] aa = AnalyticCorrelation.freeSpace(Field.A, Vec3.ZERO, a, VAC);
        double e0 = HBAR * C / (Math.PI * Math.PI * EPS0 * Math.pow(a, 4));
        double a0 = HBAR / (6 * Math.PI * Math.PI * EPS0 * C * a * a);
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                assertEquals(i == j ? e0 : 0, e[i][j], 1e-14 * e0);
                assertEquals(i == j ? a0 : 0, aa[i][j], 1e-14 * a0);
            }
        }
    }

    @Test
    void unregulatedLimits() {
        // a → 0: C^E → ħc(2r̂r̂ − δ)/(π²ε0r⁴) (Milonni, The Quantum Vacuum, 1994; source from memory),
        // with relative corrections O(a²/r²) = 1e-10 at a = 1e-5 r.
        // C^A → ħ r̂r̂/(2π²ε0cr²): parallel ħ/(2π²ε0cr²), perpendicular → 0 linearly, ≈ ħa/(8π ε0 c r³)
        // (derived, see REFERENCE-VALUES.md §5, pitfall 1: perp ≈ a/(4πr³) in units ħ/(2ε0c)).
        double r = 0.7;
        double a = 1e-5 * r;
        Vec3 sep = new Vec3(0.3, -0.2, 0.6);
        double len = sep.norm();
        Vec3 dir = new Vec3(sep.x() / len * r, sep.y() / len * r, sep.z() / len * r);
        double[][] e = AnalyticCorrelation.freeSpace(Field.E, dir, a, VAC);
        double[] n = {dir.x() / r, dir.y() / r, dir.z() / r};
        double pe = HBAR * C / (Math.PI * Math.PI * EPS0 * Math.pow(r, 4));
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                double expected = pe * (2 * n[i] * n[j] - (i == j ? 1 : 0));
                assertEquals(expected, e[i][j], 1e-8 * pe, "E[" + i + "][" + j + "]");
            }
        }
        double parA = AnalyticCorrelation.freeSpaceParallel(Field.A, r, a, VAC);
        double perpA = AnalyticCorrelation.freeSpacePerpendicular(Field.A, r, a, VAC);
        double parLimit = HBAR / (2 * Math.PI * Math.PI * EPS0 * C * r * r);
        // parallel: relative correction πa/(2r) = 1.6e-5
        assertEquals(parLimit, parA, 3e-5 * parLimit);
        // perpendicular: relative correction 4a/(πr) = 1.3e-5
        assertEquals(UNIT_A * a / (4 * Math.PI * r * r * r), perpA, 3e-5 * UNIT_A * a / (4 * Math.PI * r * r * r));
    }

    @Test
    void correlationsAreTransverse() {
        // Both fields are divergence-free, so ∂_i C_ij(r) = 0 for r ≠ 0 (PHYSICS.md §1, §4;
        // REFERENCE-VALUES.md pitfall 1 uses this to reject a non-transverse form). Central
        // differences with step 1e-4 r: truncation error ~ 1e-8 of |C|/r.
        double a = 0.1;
        for (Field f : new Field[] {Field.A, Field.E}) {
            for (Vec3 r : new Vec3[] {new Vec3(0.3, 0.1, -0.2), new Vec3(0.02, 0.03, 0.01), new Vec3(1.0, 0.5, 0.25)}) {
                double h = 1e-4 * r.norm();
                double scale = Math.abs(AnalyticCorrelation.freeSpaceParallel(f, r.norm(), a, VAC)) / r.norm();
                for (int j = 0; j < 3; j++) {
                    double div = 0;
                    for (int i = 0; i < 3; i++) {
                        double[] step = new double[3];
                        step[i] = h;
                        Vec3 s = new Vec3(step[0], step[1], step[2]);
                        double plus = AnalyticCorrelation.freeSpace(f, r.plusScaled(s, 1), a, VAC)[i][j];
                        double minus = AnalyticCorrelation.freeSpace(f, r.plusScaled(s, -1), a, VAC)[i][j];
                        div += (plus - minus) / (2 * h);
                    }
                    assertEquals(0.0, div, 1e-6 * scale, f + " divergence, column " + j + " at " + r);
                }
            }
        }
    }

    @Test
    void magneticIsElectricOverWaveSpeedSquaredInAMedium() {
        // C^B = C^E/c_m² (PHYSICS.md §4 with c → c_m), and ε0 → ε0ε_r: the E prefactor scales as
        // c_m/ε_r = c/(ε_r^{3/2}√μ_r) at fixed a. Tolerance: rounding.
        Medium glass = new Medium(2.25, 1.3);
        Vec3 s = new Vec3(0.01, 0.02, -0.015);
        double a = 0.01;
        double[][] e = AnalyticCorrelation.freeSpace(Field.E, s, a, glass);
        double[][] b = AnalyticCorrelation.freeSpace(Field.B, s, a, glass);
        double[][] ev = AnalyticCorrelation.freeSpace(Field.E, s, a, VAC);
        double cm = glass.waveSpeed();
        double factor = 1 / (Math.pow(2.25, 1.5) * Math.sqrt(1.3));
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                assertEquals(e[i][j] / (cm * cm), b[i][j], 1e-14 * Math.abs(e[0][0]) / (cm * cm));
                assertEquals(ev[i][j] * factor, e[i][j], 1e-14 * Math.abs(ev[0][0]));
            }
        }
        assertEquals(cm / 2e9, AnalyticCorrelation.windowLength(new Window(Window.Kind.EXP, 2e9, 1e-9), glass), 1e-20);
    }

    @Test
    void rejectsBadArguments() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> AnalyticCorrelation.freeSpace(Field.E, Vec3.ZERO, -1, VAC));
        assertTrue(ex.getMessage().contains("window length a") && ex.getMessage().contains("-1"), ex.getMessage());
        assertThrows(IllegalArgumentException.class,
            () -> AnalyticCorrelation.freeSpace(Field.E, new Vec3(Double.NaN, 0, 0), 1, VAC));
        ex = assertThrows(IllegalArgumentException.class,
            () -> AnalyticCorrelation.windowLength(new Window(Window.Kind.GAUSS, 1e9, 1e-9), VAC));
        assertTrue(ex.getMessage().contains("GAUSS"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> AnalyticCorrelation.freeSpaceParallel(Field.E, -1, 1, VAC));
    }

    /** ∫_0^K f dk by 32-point Gauss–Legendre on 400 equal panels. */
    static double radial(DoubleUnaryOperator f, double kMax) {
        GaussIntegratorFactory factory = new GaussIntegratorFactory();
        int panels = 400;
        double sum = 0;
        for (int p = 0; p < panels; p++) {
            GaussIntegrator g = factory.legendre(32, kMax * p / panels, kMax * (p + 1) / panels);
            sum += g.integrate(f::applyAsDouble);
        }
        return sum;
    }

    static double j0(double x) {
        return x < 1e-4 ? 1 - x * x / 6 : Math.sin(x) / x;
    }

    /** j1(x)/x, by its series near 0 where the closed form cancels. */
    static double j1OverX(double x) {
        if (x < 0.05) {
            double x2 = x * x;
            return 1.0 / 3 - x2 / 30 + x2 * x2 / 840;
        }
        return (Math.sin(x) / x - Math.cos(x)) / (x * x);
    }
}
