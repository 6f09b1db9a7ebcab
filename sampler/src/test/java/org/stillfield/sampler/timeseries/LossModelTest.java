package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

class LossModelTest {
    private static final double CU = 5.8e7;

    private static ModeTable table(RectangularCavity box, double fMaxHz) {
        return ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * fMaxHz, Window.DEFAULT_TOLERANCE),
            ThermalState.VACUUM, 1_000_000);
    }

    private static int index(ModeTable t, String family, int l, int m, int n) {
        for (int i = 0; i < t.size(); i++) {
            Mode md = t.modes().get(i);
            if (md.family().equals(family) && md.i1() == l && md.i2() == m && md.i3() == n) {
                return i;
            }
        }
        throw new AssertionError("no mode " + family + l + m + n);
    }

    /**
     * Pozar's TE10ℓ conductor Q, E along the height b, variation along a (index 1) and d (index ℓ):
     * Q_c = (k a d)³ b η / (2π² R_s) · 1/(2ℓ²a³b + 2bd³ + ℓ²a³d + ad³), R_s = √(ωμ0/2σ), k and η in the
     * filling (Pozar, Microwave Engineering, rectangular cavity Q; REFERENCE-VALUES.md §3, formula S).
     */
    private static double pozar(double a, double b, double d, int ell, double epsR, double sigma) {
        double k = Math.PI * Math.sqrt(1 / (a * a) + ell * ell / (d * d));
        double omega = k * PhysicalConstants.C / Math.sqrt(epsR);
        double eta = Math.sqrt(PhysicalConstants.MU_0 / (PhysicalConstants.EPSILON_0 * epsR));
        double rs = Math.sqrt(omega * PhysicalConstants.MU_0 / (2 * sigma));
        double kad = k * a * d;
        return kad * kad * kad * b * eta / (2 * Math.PI * Math.PI * rs)
            / (2 * ell * ell * a * a * a * b + 2 * b * d * d * d + ell * ell * a * a * a * d + a * d * d * d);
    }

    @Test
    void copperTe101BoxMatchesPozarAndTheReferenceValue() {
        // REFERENCE-VALUES.md §3 (derived, see REFERENCE-VALUES.md): TE101 air 3x2x4 cm, Cu 5.8e7 S/m
        // (common practice): f = 6.245676 GHz, Q_c = 10 806.0. The codebase's label of Pozar's TE101
        // (E along y, indices l = 1, m = 0, n = 1) is TE_1,0,1.
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = table(box, 7e9);
        int i = index(t, "TE", 1, 0, 1);
        assertEquals(6.245676e9, t.frequency(i), 0.5e3, "f of TE101");
        double q = LossModel.wallConductivity(CU).qualityFactors(t)[i];
        assertEquals(pozar(0.03, 0.02, 0.04, 1, 1, CU), q, 1e-10 * q, "direct integration vs Pozar formula");
        assertEquals(10806.0, q, 0.05, "REFERENCE-VALUES.md §3, 3x2x4 cm");
    }

    @Test
    void waveguideSectionsMatchTheReferenceValues() {
        // REFERENCE-VALUES.md §3 (derived): WR-90 2.286 x 1.016 x 2.286 cm TE101, Cu 5.8e7: f = 9.273197 GHz,
        // Q_c = 7837.8; X-band 2.2 x 1.01 x 6 cm: f = 7.257042 GHz, Q_c = 7040.4.
        RectangularCavity wr90 = RectangularCavity.of(0.02286, 0.01016, 0.02286, Medium.VACUUM);
        ModeTable t = table(wr90, 1e10);
        int i = index(t, "TE", 1, 0, 1);
        assertEquals(9.273197e9, t.frequency(i), 0.5e3);
        double q = LossModel.wallConductivity(CU).qualityFactors(t)[i];
        assertEquals(7837.8, q, 0.05, "WR-90");
        assertEquals(pozar(0.02286, 0.01016, 0.02286, 1, 1, CU), q, 1e-10 * q);

        RectangularCavity xb = RectangularCavity.of(0.022, 0.0101, 0.06, Medium.VACUUM);
        ModeTable tx = table(xb, 7.5e9);
        int j = index(tx, "TE", 1, 0, 1);
        assertEquals(7.257042e9, tx.frequency(j), 0.5e3);
        assertEquals(7040.4, LossModel.wallConductivity(CU).qualityFactors(tx)[j], 0.05, "X-band 2.2x1.01x6");
    }

    @Test
    void pozarExample63WithDielectricLoss() {
        // Pozar Ex. 6.3: WR-187 a = 4.755 cm, b = 2.215 cm, eps_r = 2.25, tan δ = 4e-4, σ = 5.813e7, f = 5 GHz
        // (inputs S). d from the resonance of TE10ℓ. Computed (derived, REFERENCE-VALUES.md §3): ℓ = 1:
        // d = 2.2026 cm, R_s = 1.84274e-2 Ω, Q_c = 8412.3, Q = 1927.2, linewidth f/Q = 2.594 MHz;
        // ℓ = 2: d = 4.4053 cm, Q_c = 11 907.8, Q = 2066.2. Published answers (source from memory):
        // Q_c = 8403 / 11 898, Q = 1927 / 2065, compared at 0.5 % (rounded constants, REFERENCE-VALUES.md §3).
        double a = 0.04755;
        double b = 0.02215;
        double epsR = 2.25;
        double sigma = 5.813e7;
        double f0 = 5e9;
        double[][] expected = {{2.2026e-2, 8412.3, 1927.2, 8403, 1927}, {4.4053e-2, 11907.8, 2066.2, 11898, 2065}};
        for (int ell = 1; ell <= 2; ell++) {
            double k = 2 * Math.PI * f0 * Math.sqrt(epsR) / PhysicalConstants.C;
            double d = ell * Math.PI / Math.sqrt(k * k - Math.pow(Math.PI / a, 2));
            double[] ref = expected[ell - 1];
            assertEquals(ref[0], d, 0.5e-6, "d for ℓ = " + ell);
            RectangularCavity box = RectangularCavity.of(a, b, d, new Medium(epsR, 1));
            ModeTable t = table(box, 5.2e9);
            int i = index(t, "TE", 1, 0, ell);
            assertEquals(f0, t.frequency(i), 1e-3);
            if (ell == 1) {
                assertEquals(1.84274e-2, BoxWallLoss.surfaceResistance(t.omega(i), sigma), 0.5e-7, "R_s");
            }
            double qc = LossModel.wallConductivity(sigma).qualityFactors(t)[i];
            assertEquals(pozar(a, b, d, ell, epsR, sigma), qc, 1e-10 * qc, "direct vs formula, ℓ = " + ell);
            assertEquals(ref[1], qc, 0.05, "Q_c, ℓ = " + ell);
            assertEquals(ref[3], qc, 0.005 * ref[3], "published Q_c, ℓ = " + ell);
            ModeDamping dmp = ModeDamping.of(t, LossModel.combined(LossModel.wallConductivity(sigma),
                LossModel.dielectric(4e-4)));
            double q = dmp.qualityFactor(i);
            // 1/Q = 1/Q_c + 1/Q_d with Q_d = 1/tan δ (Pozar; REFERENCE-VALUES.md §3).
            assertEquals(1 / (1 / qc + 4e-4), q, 1e-12 * q);
            assertEquals(ref[2], q, 0.05, "Q, ℓ = " + ell);
            assertEquals(ref[4], q, 0.005 * ref[4], "published Q, ℓ = " + ell);
            assertEquals(t.omega(i) / q, dmp.kappa(i), 1e-9 * dmp.kappa(i), "κ = ω/Q");
            if (ell == 1) {
                assertEquals(2.594e6, dmp.linewidthHz(i), 0.5e3, "κ/2π = f/Q");
            }
        }
    }

    @Test
    void otherOrientationsOfOneZeroIndexModesMatchPozarRelabelled() {
        // A one-zero-index box mode is a TE10ℓ mode of the same box seen along another axis: the field
        // lies along the zero index's axis (height), the two non-zero indices give the variation.
        // TM_1,1,0 of (a, b, d): E along z, so Pozar's (a, b, d, ℓ) = (a, d, b, 1).
        // TE_0,1,2 of (a, b, d): E along x, so Pozar's (a, b, d, ℓ) = (b, a, d, 2) with index 1 along y.
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = table(box, 12e9);
        double[] q = LossModel.wallConductivity(CU).qualityFactors(t);
        double tm110 = q[index(t, "TM", 1, 1, 0)];
        assertEquals(pozar(0.03, 0.04, 0.02, 1, 1, CU), tm110, 1e-10 * tm110, "TM_1,1,0");
        double te012 = q[index(t, "TE", 0, 1, 2)];
        assertEquals(pozar(0.02, 0.03, 0.04, 2, 1, CU), te012, 1e-10 * te012, "TE_0,1,2");
    }

    @Test
    void everyModeMatchesClosedFormWallIntegrals() {
        // Independent of the quadrature and of ModeFunctions: ∮|h_t|² from the mode formulas of
        // PHYSICS.md §1 / RectangularCavity (h = N (k×e)/k, factors sin/cos; ∫₀^L sin² = L/2 or 0,
        // ∫₀^L cos² = L/2 or L), then Q_c = μωV/(R_s ∮|h_t|²) (BoxWallLoss, perturbation method;
        // derived). All modes (74) up to 15 GHz of a 3x2x4 cm box filled with eps_r = 1.7, mu_r = 1.3,
        // both families.
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, new Medium(1.7, 1.3));
        ModeTable t = table(box, 15e9);
        assertTrue(t.size() >= 50, "modes up to 15 GHz: " + t.size());
        double[] q = LossModel.wallConductivity(CU).qualityFactors(t);
        for (int i = 0; i < t.size(); i++) {
            Mode md = t.modes().get(i);
            double s = closedFormWallIntegral(md, 0.03, 0.02, 0.04);
            double w = t.omega(i);
            double rs = Math.sqrt(w * PhysicalConstants.MU_0 / (2 * CU));
            double expected = box.medium().permeability() * w * box.volume() / (rs * s);
            assertEquals(expected, q[i], 1e-10 * expected, md.label());
        }
    }

    private static double closedFormWallIntegral(Mode md, double a, double b, double d) {
        int l = md.i1();
        int m = md.i2();
        int n = md.i3();
        double kx = l * Math.PI / a;
        double ky = m * Math.PI / b;
        double kz = n * Math.PI / d;
        double k = Math.sqrt(kx * kx + ky * ky + kz * kz);
        double[] e;
        double norm;
        int zeros = (l == 0 ? 1 : 0) + (m == 0 ? 1 : 0) + (n == 0 ? 1 : 0);
        if (zeros == 1) {
            norm = 2;
            e = new double[] {l == 0 ? 1 : 0, m == 0 ? 1 : 0, n == 0 ? 1 : 0};
        } else {
            norm = Math.sqrt(8);
            double kr = Math.hypot(kx, ky);
            e = md.family().equals("TE") ? new double[] {-ky / kr, kx / kr, 0}
                : new double[] {-kx * kz / (kr * k), -ky * kz / (kr * k), kr / k};
        }
        double hx = norm * (ky * e[2] - kz * e[1]) / k;
        double hy = norm * (kz * e[0] - kx * e[2]) / k;
        double hz = norm * (kx * e[1] - ky * e[0]) / k;
        // h_x ∝ sin(kx x) cos(ky y) cos(kz z), h_y ∝ cos sin cos, h_z ∝ cos cos sin.
        double xWalls = hy * hy * is(m, b) * ic(n, d) + hz * hz * ic(m, b) * is(n, d);
        double yWalls = hx * hx * is(l, a) * ic(n, d) + hz * hz * ic(l, a) * is(n, d);
        double zWalls = hx * hx * is(l, a) * ic(m, b) + hy * hy * ic(l, a) * is(m, b);
        return 2 * (xWalls + yWalls + zWalls);
    }

    private static double is(int n, double len) {
        return n == 0 ? 0 : len / 2;
    }

    private static double ic(int n, double len) {
        return n == 0 ? len : len / 2;
    }

    @Test
    void constantAndLosslessModels() {
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        ModeDamping c = ModeDamping.of(t, LossModel.constant(250));
        ModeDamping none = ModeDamping.of(t, LossModel.lossless());
        for (int l = 0; l < t.size(); l++) {
            assertEquals(t.omega(l) / 250, c.kappa(l), 1e-9 * c.kappa(l));
            assertEquals(0.0, none.kappa(l));
            assertEquals(Double.POSITIVE_INFINITY, none.qualityFactor(l));
        }
        assertEquals(t.size(), c.lossyCount());
        assertEquals(0, none.lossyCount());
        assertEquals(250, c.minQualityFactor());
    }

    @Test
    void rejectsBadInputs() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> LossModel.constant(-3));
        assertTrue(ex.getMessage().contains("loss.q") && ex.getMessage().contains("-3"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> LossModel.wallConductivity(Double.NaN));
        assertTrue(ex.getMessage().contains("wall_sigma") && ex.getMessage().contains("NaN"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> LossModel.dielectric(0));
        assertTrue(ex.getMessage().contains("tan_delta"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, LossModel::combined);
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        ex = assertThrows(IllegalArgumentException.class, () -> ModeDamping.of(t, new double[] {1, 2}, "x"));
        assertTrue(ex.getMessage().contains("2 values for 6 modes"), ex.getMessage());
        double[] bad = new double[t.size()];
        java.util.Arrays.fill(bad, 10);
        bad[3] = Double.NaN;
        ex = assertThrows(IllegalArgumentException.class, () -> ModeDamping.of(t, bad, "x"));
        assertTrue(ex.getMessage().contains(t.modes().get(3).label()) && ex.getMessage().contains("NaN"),
            ex.getMessage());
        // Wall losses need the faces of the shape: only the box has them here.
        ModeTable other = ModeTable.of(new OtherShape(Fixtures.box()), t.window(), ThermalState.VACUUM, 1000);
        ex = assertThrows(IllegalArgumentException.class, () -> LossModel.wallConductivity(CU).qualityFactors(other));
        assertTrue(ex.getMessage().contains("box only") && ex.getMessage().contains("other"), ex.getMessage());
    }

    /** A cavity that is not a RectangularCavity (delegates everything but its shape name). */
    static final class OtherShape implements Cavity {
        private final Cavity inner;

        OtherShape(Cavity inner) {
            this.inner = inner;
        }

        @Override
        public String shape() {
            return "other";
        }

        @Override
        public Map<String, Double> parameters() {
            return inner.parameters();
        }

        @Override
        public Medium medium() {
            return inner.medium();
        }

        @Override
        public double volume() {
            return inner.volume();
        }

        @Override
        public Vec3[] bounds() {
            return inner.bounds();
        }

        @Override
        public boolean contains(Vec3 r) {
            return inner.contains(r);
        }

        @Override
        public double weylCount(double k) {
            return inner.weylCount(k);
        }

        @Override
        public double lowestK() {
            return inner.lowestK();
        }

        @Override
        public List<Mode> modesUpTo(double kMax) {
            return inner.modesUpTo(kMax);
        }

        @Override
        public ModeFunctions modeFunctions(List<Mode> modes) {
            return inner.modeFunctions(modes);
        }
    }
}
