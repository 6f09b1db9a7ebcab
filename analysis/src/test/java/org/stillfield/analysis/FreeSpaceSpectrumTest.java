package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/** The spectral quadrature against closed forms of PHYSICS.md §4 and REFERENCE-VALUES.md §5–6. */
class FreeSpaceSpectrumTest {
    private static final Medium VAC = Medium.VACUUM;
    private static final double C = VAC.waveSpeed();
    private static final double HBAR = PhysicalConstants.HBAR;
    private static final double EPS = VAC.permittivity();

    /** Exponential window whose truncation drops ~1e-12 of ⟨E²⟩ (Q(4, 36.8)), so it matches the untruncated closed form. */
    private static Window exp(double a) {
        return new Window(Window.Kind.EXP, C / a, 1e-16);
    }

    @Test
    void exponentialWindowMatchesTheClosedFormsForEveryField() {
        // REFERENCE-VALUES.md §5 (derived there, verified to 10 digits by quadrature; the E limit is
        // Milonni 1994, source from memory), as implemented by AnalyticCorrelation.
        double a = 0.01;
        for (Field f : Field.values()) {
            FreeSpaceSpectrum s = FreeSpaceSpectrum.correlation(f, exp(a), ThermalState.VACUUM, VAC);
            for (double r : new double[] {0.0, 0.002, 0.01, 0.03, 0.2}) {
                double par = AnalyticCorrelation.freeSpaceParallel(f, r, a, VAC);
                double perp = AnalyticCorrelation.freeSpacePerpendicular(f, r, a, VAC);
                double scale = Math.abs(AnalyticCorrelation.freeSpaceParallel(f, 0, a, VAC));
                // Relative to C(0): far out, C itself is ~1e-8 of C(0) and the quadrature is
                // absolute-accurate, so both are compared at 1e-10 of C(0) and 1e-7 of themselves.
                assertEquals(par, s.parallel(r), 1e-10 * scale + 1e-7 * Math.abs(par), f + " parallel at r = " + r);
                assertEquals(perp, s.perpendicular(r), 1e-10 * scale + 1e-7 * Math.abs(perp), f + " perpendicular at r = " + r);
            }
        }
    }

    @Test
    void tensorAndPlaneImageMatchTheClosedFormConstruction() {
        double a = 0.01;
        Vec3 r = new Vec3(0.01, 0.02, 0.004);
        Vec3 r2 = new Vec3(0.017, 0.015, 0.011);
        for (Field f : Field.values()) {
            FreeSpaceSpectrum s = FreeSpaceSpectrum.correlation(f, exp(a), ThermalState.VACUUM, VAC);
            double[][] want = AnalyticCorrelation.nearPlane(f, 2, 0.0, r, r2, a, VAC);
            double[][] got = s.nearPlane(f, 2, 0.0, r, r2);
            double scale = Math.abs(AnalyticCorrelation.freeSpaceParallel(f, 0, a, VAC));
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    assertEquals(want[i][j], got[i][j], 1e-10 * scale, f + " near plane [" + i + "][" + j + "]");
                }
            }
        }
    }

    @Test
    void hardCutoffMeanSquareIsTheClosedForm() {
        // PHYSICS.md §4: hard cutoff k_c gives <E²>(0) = ħ c k_c⁴/(8π² ε0); B = E/c², and
        // <A²>(0) = ħ k_c²/(4π² ε0 c) from the same integral with k⁻¹ (2/3 of the trace per component).
        double kc = 300;
        Window hard = new Window(Window.Kind.HARD, C * kc, Window.DEFAULT_TOLERANCE);
        FreeSpaceSpectrum e = FreeSpaceSpectrum.correlation(Field.E, hard, ThermalState.VACUUM, VAC);
        double e2 = 3 * e.parallel(0);
        double want = HBAR * C * Math.pow(kc, 4) / (8 * Math.PI * Math.PI * EPS);
        assertEquals(want, e2, 1e-12 * want, "<E^2> hard cutoff");
        FreeSpaceSpectrum b = FreeSpaceSpectrum.correlation(Field.B, hard, ThermalState.VACUUM, VAC);
        assertEquals(want / (C * C), 3 * b.parallel(0), 1e-12 * want / (C * C), "<B^2> = <E^2>/c^2");
        FreeSpaceSpectrum aa = FreeSpaceSpectrum.correlation(Field.A, hard, ThermalState.VACUUM, VAC);
        double wantA = HBAR * kc * kc / (4 * Math.PI * Math.PI * EPS * C);
        assertEquals(wantA, 3 * aa.parallel(0), 1e-12 * wantA, "<A^2> hard cutoff");
    }

    @Test
    void hardCutoffKernelAlongTheSeparationIsTheBesselClosedForm() {
        // Derived: K_E,∥(r) = (2ε0/ħc)(1/2π²)∫_0^{k_c} k·2j₁(kr)/(kr) dk = (2ε0/ħc)(1 − j₀(k_c r))/(π² r²),
        // since ∫_0^X j₁ = 1 − j₀(X); as k_c → ∞ it is K_E = (2ε0/ħc) r̂r̂/(π²r²) (REFERENCE-VALUES.md
        // pitfall 3). Across: (2ε0/ħc)(sin X/X − cos X)/(2π² r²), from ∫_0^X (sin x − j₁) = sin X/X − cos X.
        double kc = 300;
        Window hard = new Window(Window.Kind.HARD, C * kc, Window.DEFAULT_TOLERANCE);
        FreeSpaceSpectrum k = FreeSpaceSpectrum.kernel(Field.E, hard, ThermalState.VACUUM, VAC, q -> 1.0);
        double pre = 2 * EPS / (HBAR * C);
        for (double r : new double[] {0.001, 0.01, 0.05, 0.3}) {
            double x = kc * r;
            double par = pre * (1 - Math.sin(x) / x) / (Math.PI * Math.PI * r * r);
            double perp = pre * (Math.sin(x) / x - Math.cos(x)) / (2 * Math.PI * Math.PI * r * r);
            assertEquals(par, k.parallel(r), 1e-10 * Math.abs(par), "K_E parallel at r = " + r);
            assertEquals(perp, k.perpendicular(r), 1e-9 * Math.abs(par), "K_E perpendicular at r = " + r);
        }
    }

    @Test
    void exponentialRegulatorKernelIsTheOtherFieldsCorrelation() {
        // With ρ = e^{−kb}: K_E = (2ε0/ħ)² C^A(b) and K_A = (2ε0/ħ)² C^E(b) (derived: the kernel
        // weights 1/(Vσ²) are the other field's Vσ² times (2ε0/ħ)²), closed forms of REFERENCE-VALUES.md §5.
        double b = 0.02;
        double kc = 40 / b;
        Window hard = new Window(Window.Kind.HARD, C * kc, Window.DEFAULT_TOLERANCE);
        double f2 = Math.pow(2 * EPS / HBAR, 2);
        FreeSpaceSpectrum ke = FreeSpaceSpectrum.kernel(Field.E, hard, ThermalState.VACUUM, VAC, q -> Math.exp(-q * b));
        FreeSpaceSpectrum ka = FreeSpaceSpectrum.kernel(Field.A, hard, ThermalState.VACUUM, VAC, q -> Math.exp(-q * b));
        for (double r : new double[] {0.0, 0.01, 0.05, 0.2}) {
            double ePar = f2 * AnalyticCorrelation.freeSpaceParallel(Field.A, r, b, VAC);
            double ePerp = f2 * AnalyticCorrelation.freeSpacePerpendicular(Field.A, r, b, VAC);
            double aPar = f2 * AnalyticCorrelation.freeSpaceParallel(Field.E, r, b, VAC);
            double aPerp = f2 * AnalyticCorrelation.freeSpacePerpendicular(Field.E, r, b, VAC);
            double se = f2 * AnalyticCorrelation.freeSpaceParallel(Field.A, 0, b, VAC);
            double sa = f2 * AnalyticCorrelation.freeSpaceParallel(Field.E, 0, b, VAC);
            // Truncation at k_c b = 40 drops e^{-40}(40³ + ...) ~ 1e-13 of the A-kernel integral.
            assertEquals(ePar, ke.parallel(r), 1e-10 * se, "K_E parallel r = " + r);
            assertEquals(ePerp, ke.perpendicular(r), 1e-10 * se, "K_E perpendicular r = " + r);
            assertEquals(aPar, ka.parallel(r), 1e-10 * sa, "K_A parallel r = " + r);
            assertEquals(aPerp, ka.perpendicular(r), 1e-10 * sa, "K_A perpendicular r = " + r);
        }
    }

    @Test
    void energyDensityExcessNearOnePlateVanishesForAGaussianWindow() {
        // REFERENCE-VALUES.md pitfall 8 / §6 (Lütken & Ravndal 1985, source from memory): the E² and
        // B² image terms cancel in ε0<E²>/2 + <B²>/2μ0 at every distance, for any window.
        Window g = new Window(Window.Kind.GAUSS, C * 200, 1e-14);
        FreeSpaceSpectrum e = FreeSpaceSpectrum.correlation(Field.E, g, ThermalState.VACUUM, VAC);
        FreeSpaceSpectrum b = FreeSpaceSpectrum.correlation(Field.B, g, ThermalState.VACUUM, VAC);
        for (double z : new double[] {0.001, 0.005, 0.02}) {
            Vec3 r = new Vec3(0.3, 0.2, z);
            double[][] ie = e.planeImage(Field.E, 2, 0.0, r, r);
            double[][] ib = b.planeImage(Field.B, 2, 0.0, r, r);
            double de = ie[0][0] + ie[1][1] + ie[2][2];
            double db = ib[0][0] + ib[1][1] + ib[2][2];
            double u = 0.5 * EPS * de + 0.5 * db / VAC.permeability();
            assertEquals(0.0, u, 1e-12 * 0.5 * EPS * Math.abs(de), "energy excess at z = " + z);
        }
        assertThrows(IllegalArgumentException.class, () -> e.parallel(-1));
        assertThrows(IllegalArgumentException.class, () -> e.planeImage(Field.E, 2, 0.0, new Vec3(0, 0, 1),
            new Vec3(0, 0, -1)));
    }
}
