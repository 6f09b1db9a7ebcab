package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.stream.Collectors;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
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

class CylinderCavityTest {
    private static final double C = PhysicalConstants.C;
    /** Unit-scale cylinder used for the field checks: R = 1, d = 1.3. */
    private static final double R = 1.0;
    private static final double D = 1.3;
    private static final Cavity UNIT = CylindricalCavity.of(R, D, Medium.VACUUM);

    private static double freq(Mode m) {
        return m.k() * C / (2 * Math.PI);
    }

    private static List<Mode> lowModes() {
        // k ≤ 5.8 keeps TM010 … TE011/TM111 (the degenerate TE_0mp/TM_1mp pair) and n up to 3.
        return UNIT.modesUpTo(5.8);
    }

    @Test
    void lowestModesOfThePillboxMatchTheWorkedExample() {
        // R = 5 cm, d = 10 cm: f(TM010) = 2.294851 GHz, f(TE111) = 2.309520 GHz, derived, see
        // REFERENCE-VALUES.md §3 (formulas Pozar, Microwave Engineering, source from memory).
        Cavity c = CylindricalCavity.of(0.05, 0.10, Medium.VACUUM);
        List<Mode> modes = c.modesUpTo(2 * Math.PI * 3e9 / C);
        assertEquals("TM_0,1,0", modes.get(0).label());
        assertEquals(2.294851e9, freq(modes.get(0)), 0.6e3);
        // TM010: f = x_01 c/(2πR), x_01 = 2.404825557695773 (REFERENCE-VALUES.md §2a).
        assertEquals(2.404825557695773 * C / (2 * Math.PI * 0.05), freq(modes.get(0)), 1e-12 * 2.3e9);
        assertEquals("TE_1,1,1", modes.get(1).label());
        assertEquals("TE_1,1,1/1", modes.get(2).label());
        assertEquals(2.309520e9, freq(modes.get(1)), 0.6e3);
        assertEquals(modes.get(1).k(), modes.get(2).k(), 0.0);
        // Below 3 GHz only TM010, TE111 (×2) and TM011 (2.742 GHz) lie: the next, TE211, is at
        // 3.28 GHz (Pozar's formula with the §2a zeros, derived).
        assertEquals(4, modes.size(), modes.stream().map(Mode::label).collect(Collectors.joining(" ")));
        assertEquals("TM_0,1,1", modes.get(3).label());
        assertEquals(modes.get(0).k(), c.lowestK(), 0.0);
    }

    @Test
    void longCylinderHasTe111AsLowestMode() {
        // TM010 is lowest only for d/R < π/√(x01² − x'11²) = 2.03076 (REFERENCE-VALUES.md §3, derived).
        Cavity shortOne = CylindricalCavity.of(1.0, 2.0, Medium.VACUUM);
        Cavity longOne = CylindricalCavity.of(1.0, 2.07, Medium.VACUUM);
        assertEquals("TM_0,1,0", shortOne.modesUpTo(3.0).get(0).label());
        assertEquals("TE_1,1,1", longOne.modesUpTo(3.0).get(0).label());
        assertEquals(longOne.modesUpTo(3.0).get(0).k(), longOne.lowestK(), 1e-15);
    }

    @Test
    void degenerateTe0mpAndTm1mpAreBothKept() {
        // PHYSICS.md §1: x'_0m = x_1m, so TE_0mp and TM_1mp share k; both are distinct modes.
        List<Mode> modes = lowModes();
        Mode te011 = find(modes, "TE_0,1,1");
        Mode tm111 = find(modes, "TM_1,1,1");
        Mode tm111s = find(modes, "TM_1,1,1/1");
        assertEquals(te011.k(), tm111.k(), 0.0);
        assertEquals(te011.k(), tm111s.k(), 0.0);
        // k² = (3.831705970207512/R)² + (π/d)² (REFERENCE-VALUES.md §2a).
        assertEquals(Math.hypot(3.831705970207512, Math.PI / D), te011.k(), 1e-14);
    }

    private static Mode find(List<Mode> modes, String label) {
        return modes.stream().filter(m -> m.label().equals(label)).findFirst()
            .orElseThrow(() -> new AssertionError(label + " missing from " + modes.stream().map(Mode::label).collect(Collectors.toList())));
    }

    @Test
    void modesAreOrthonormalByQuadrature() {
        // Independent check of the analytic normalisation (Lommel's integral): Gauss–Legendre in ρ
        // (40 nodes, smooth integrand of degree ≲ 20 in γρ ≤ 5), uniform φ (48 nodes, exact for
        // trigonometric degree < 48), Gauss–Legendre in z (24 nodes). Quadrature error ≪ 1e-12.
        List<Mode> modes = lowModes();
        assertTrue(modes.size() >= 20 && modes.size() <= 40, "mode count " + modes.size());
        double[][] rho = ModeFieldChecks.legendre(40, 0, R);
        double[][] zz = ModeFieldChecks.legendre(24, 0, D);
        int nPhi = 48;
        double[][][] g = ModeFieldChecks.gram(UNIT, modes, sink -> {
            for (int i = 0; i < rho[0].length; i++) {
                for (int j = 0; j < nPhi; j++) {
                    double phi = 2 * Math.PI * j / nPhi;
                    for (int k = 0; k < zz[0].length; k++) {
                        double w = rho[1][i] * rho[0][i] * (2 * Math.PI / nPhi) * zz[1][k];
                        sink.accept(new ModeFieldChecks.Node(R + rho[0][i] * Math.cos(phi), R + rho[0][i] * Math.sin(phi),
                            zz[0][k], w));
                    }
                }
            }
        });
        ModeFieldChecks.assertIdentity(g[0], modes, 1e-12, "(1/V)∫u·u'");
        ModeFieldChecks.assertIdentity(g[1], modes, 1e-12, "(1/V)∫h·h'");
    }

    @Test
    void wallConditionsHoldAtRandomWallPoints() {
        // PHYSICS.md §1: n×u = 0 and n·h = 0 on the walls. Seeded points on the side wall and both
        // caps; ~600 modes up to n ≈ 14 so high orders are covered. Tolerance: the zeros carry
        // ~1e-16 relative error, which leaves |J_n(γR)| ~ 1e-15·x.
        List<Mode> modes = UNIT.modesUpTo(16.0);
        ModeFunctions f = UNIT.modeFunctions(modes);
        int m = modes.size();
        double[] u = new double[3 * m];
        double[] h = new double[3 * m];
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(20261201L);
        for (int t = 0; t < 150; t++) {
            int wall = t % 3;
            double phi = 2 * Math.PI * rng.nextDouble();
            double[] n;
            double x;
            double y;
            double z;
            if (wall == 0) {
                x = R + R * Math.cos(phi);
                y = R + R * Math.sin(phi);
                z = D * rng.nextDouble();
                n = new double[] {Math.cos(phi), Math.sin(phi), 0};
            } else {
                double rr = R * Math.sqrt(rng.nextDouble());
                x = R + rr * Math.cos(phi);
                y = R + rr * Math.sin(phi);
                z = wall == 1 ? 0 : D;
                n = new double[] {0, 0, wall == 1 ? -1 : 1};
            }
            f.evaluate(x, y, z, u, h);
            for (int l = 0; l < m; l++) {
                int j = 3 * l;
                double cx = n[1] * u[j + 2] - n[2] * u[j + 1];
                double cy = n[2] * u[j] - n[0] * u[j + 2];
                double cz = n[0] * u[j + 1] - n[1] * u[j];
                double tangential = Math.sqrt(cx * cx + cy * cy + cz * cz);
                double normalH = n[0] * h[j] + n[1] * h[j + 1] + n[2] * h[j + 2];
                String at = modes.get(l).label() + " on wall " + wall + " at (" + x + ", " + y + ", " + z + ")";
                assertTrue(tangential < 1e-12, "|n×u| = " + tangential + " for " + at);
                assertTrue(Math.abs(normalH) < 1e-12, "n·h = " + normalH + " for " + at);
            }
        }
    }

    @Test
    void fieldsSatisfyMaxwellByFiniteDifferences() {
        // ∇·u = 0, ∇²u + k²u = 0 and h = (1/k)∇×u (PHYSICS.md §1), checked by central differences
        // at seeded interior points including ones within 1e-3 of the axis.
        List<Mode> modes = lowModes();
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(7L);
        double[][] pts = new double[12][];
        for (int i = 0; i < pts.length; i++) {
            double rr = i < 3 ? 1e-3 * rng.nextDouble() : 0.95 * R * Math.sqrt(rng.nextDouble());
            double phi = 2 * Math.PI * rng.nextDouble();
            pts[i] = new double[] {R + rr * Math.cos(phi), R + rr * Math.sin(phi), 0.02 + (D - 0.04) * rng.nextDouble()};
        }
        ModeFieldChecks.assertFieldEquations(UNIT, modes, pts);
    }

    @Test
    void axisValuesAreFiniteAndContinuous() {
        // No 0/0 on the axis: values there are finite and within |∇u|·1e-9 ≲ 1e-8 of the values
        // 1e-9 away in any direction (common practice for a removable-singularity check).
        List<Mode> modes = UNIT.modesUpTo(12.0);
        ModeFunctions f = UNIT.modeFunctions(modes);
        for (double z : new double[] {0.0, 0.37, D}) {
            for (boolean magnetic : new boolean[] {false, true}) {
                double[] axis = ModeFieldChecks.eval(f, R, R, z, magnetic);
                for (double a : new double[] {0.0, 1.0, 2.5, 4.0}) {
                    double[] near = ModeFieldChecks.eval(f, R + 1e-9 * Math.cos(a), R + 1e-9 * Math.sin(a), z, magnetic);
                    for (int q = 0; q < axis.length; q++) {
                        assertTrue(Double.isFinite(axis[q]), "non-finite on the axis: " + modes.get(q / 3).label());
                        assertEquals(axis[q], near[q], 1e-7, modes.get(q / 3).label() + " component " + q % 3
                            + (magnetic ? " of h" : " of u") + " at z = " + z + ", direction " + a);
                    }
                }
            }
        }
    }

    @Test
    void modeCountFollowsWeylWithTheDerivedEdgeAndCurvatureTerms() {
        // N(k) ≈ Vk³/(3π²) − (R/2 + 2d/(3π))k + 1/2 (derived in CylindricalCavity#weylCount). The
        // bound is empirical: for R = 1, d = 1.7 the window means of N − Weyl lie within ±0.15 while
        // the rms grows from 3.4 to 15 (like the box, REFERENCE-VALUES.md pitfall 2); |mean| ≤ 1 is
        // asserted. Without the O(k) terms the means would be −8 … −46, so they are needed.
        Cavity c = CylindricalCavity.of(1.0, 1.7, Medium.VACUUM);
        double kMax = 60;
        double[] ks = c.modesUpTo(kMax).stream().mapToDouble(Mode::k).toArray();
        double v = c.volume();
        for (int w = 0; w < 5; w++) {
            double a = 5 + 11 * w;
            double b = a + 11;
            int steps = 2000;
            double sum = 0;
            double sumLead = 0;
            for (int i = 0; i < steps; i++) {
                double k = a + (b - a) * (i + 0.5) / steps;
                int n = countAtMost(ks, k);
                sum += n - c.weylCount(k);
                sumLead += n - v * k * k * k / (3 * Math.PI * Math.PI);
            }
            double mean = sum / steps;
            assertTrue(Math.abs(mean) <= 1.0, "mean N − Weyl on [" + a + ", " + b + ") = " + mean);
            assertTrue(sumLead / steps < -5, "leading term alone should undercount less than it does: " + sumLead / steps);
        }
    }

    static int countAtMost(double[] sorted, double k) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= k) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    @Test
    void fillingChangesOnlyTheFrequencies() {
        // PHYSICS.md §1: ω = c k/√(ε_r μ_r); the mode functions do not depend on the filling.
        Cavity empty = CylindricalCavity.of(0.05, 0.10, Medium.VACUUM);
        Cavity filled = CylindricalCavity.of(0.05, 0.10, new Medium(2.25, 1.0));
        Window window = new Window(Window.Kind.HARD, 2 * Math.PI * 3.1e9, Window.DEFAULT_TOLERANCE);
        ModeTable te = ModeTable.of(empty, window, ThermalState.VACUUM, 1000);
        ModeTable tf = ModeTable.of(filled, window, ThermalState.VACUUM, 1000);
        // At 3.1 GHz the filled cavity (c/1.5) holds modes up to 4.65 GHz of the empty one.
        assertTrue(tf.size() > te.size(), "filled " + tf.size() + " vs empty " + te.size());
        assertEquals(2.294851e9 / 1.5, tf.frequency(0), 1e3);
        double[] a = ModeFieldChecks.eval(empty.modeFunctions(te.modes()), 0.06, 0.04, 0.03, false);
        double[] b = ModeFieldChecks.eval(filled.modeFunctions(te.modes()), 0.06, 0.04, 0.03, false);
        for (int q = 0; q < a.length; q++) {
            assertEquals(a[q], b[q], 0.0);
        }
    }

    @Test
    void boundsAndContainsAgree() {
        Cavity c = CylindricalCavity.of(0.05, 0.10, Medium.VACUUM);
        Vec3[] b = c.bounds();
        assertEquals(new Vec3(0, 0, 0), b[0]);
        assertEquals(new Vec3(0.1, 0.1, 0.1), b[1]);
        assertTrue(c.contains(new Vec3(0.05, 0.05, 0.05)));
        assertTrue(c.contains(new Vec3(0.05 + 0.05 * Math.cos(1.0), 0.05 + 0.05 * Math.sin(1.0), 0.1)));
        assertTrue(c.contains(new Vec3(0.0, 0.05, 0.0)));
        assertFalse(c.contains(new Vec3(0.0, 0.0, 0.05)), "bounding-box corner is outside the cylinder");
        assertFalse(c.contains(new Vec3(0.05, 0.05, 0.1000001)));
        assertEquals(Math.PI * 0.05 * 0.05 * 0.1, c.volume(), 1e-18);
    }

    @Test
    void rejectsBadDimensionsNamingTheSetting() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
            () -> CylindricalCavity.of(-0.05, 0.1, Medium.VACUUM));
        assertTrue(e.getMessage().contains("cavity.radius_m") && e.getMessage().contains("-0.05"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> CylindricalCavity.of(0.05, Double.NaN, Medium.VACUUM));
        assertTrue(e.getMessage().contains("cavity.length_m") && e.getMessage().contains("NaN"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> UNIT.modeFunctions(List.of(new Mode("TE", 0, 1, 0, 0, 3.0))));
        assertThrows(IllegalArgumentException.class, () -> UNIT.modeFunctions(List.of(new Mode("COS", 1, 0, 0, 0, 3.0))));
    }

    @Test
    void yamlSpecRunsThroughThePipelineWithTheOutsideMasked() throws Exception {
        // End to end through the Cavity seam: finite fields inside, NaN at the grid points in the
        // corners of the bounding box (outside the circle).
        String yaml = String.join("\n",
            "cavity:",
            "  shape: cylinder",
            "  radius_m: 0.05",
            "  length_m: 0.10",
            "window:",
            "  kind: exp",
            "  cutoff_GHz: 4",
            "  tolerance: 1.0e-3",
            "samples: 5",
            "seed: 11",
            "threads: 2",
            "evaluate:",
            "  points:",
            "    - name: axis",
            "      at: [0.05, 0.05, 0.0]",
            "  grids:",
            "    - name: slice",
            "      n: [4, 4, 1]",
            "");
        ModeFieldChecks.PipelineResult r = ModeFieldChecks.runPipeline(yaml);
        assertEquals("cylinder", r.spec().cavity().shape());
        ModeFieldChecks.assertMaskedInsideFinite(r);
    }
}
