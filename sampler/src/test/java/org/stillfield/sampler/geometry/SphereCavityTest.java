package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
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

class SphereCavityTest {
    private static final double C = PhysicalConstants.C;
    private static final double R = 1.0;
    private static final Cavity UNIT = SphericalCavity.of(R, Medium.VACUUM);

    private static List<Mode> lowModes() {
        // kR ≤ 6: TM1, TM2, TE1, TM3, TE2 multiplets, 23 modes with n ≤ 3.
        return UNIT.modesUpTo(6.0);
    }

    @Test
    void lowestMultipletsForATenCentimetreSphere() {
        // R = 0.1 m: f(TM1) = 1.309117 GHz, f(TM2) = 1.846624 GHz, f(TE1) = 2.143961 GHz with
        // degeneracies 3, 5, 3; derived, see REFERENCE-VALUES.md §2b/2c.
        Cavity c = SphericalCavity.of(0.1, Medium.VACUUM);
        List<Mode> modes = c.modesUpTo(2 * Math.PI * 2.2e9 / C);
        assertEquals(11, modes.size());
        String[] family = {"TM", "TM", "TE"};
        int[] order = {1, 2, 1};
        double[] f = {1.309117e9, 1.846624e9, 2.143961e9};
        int at = 0;
        for (int g = 0; g < 3; g++) {
            int deg = 2 * order[g] + 1;
            for (int o = 0; o < deg; o++) {
                Mode m = modes.get(at++);
                assertEquals(family[g], m.family(), m.label());
                assertEquals(order[g], m.i1(), m.label());
                assertEquals(o, m.orientation(), m.label());
                assertEquals(f[g], m.k() * C / (2 * Math.PI), 0.6e3, m.label());
            }
        }
        assertEquals(modes.get(0).k(), c.lowestK(), 0.0);
    }

    @Test
    void modeCountUpToKr80MatchesTheRegressionCount() {
        // N(kR ≤ 80) = 72 269 with degeneracy, derived (scipy root count), see REFERENCE-VALUES.md §2.
        assertEquals(72269, UNIT.modesUpTo(80.0).size());
    }

    @Test
    void windowAveragedCountFollowsWeylWithTheCurvatureTerm() {
        // Empirical bound: with the −(8/3π)kR term the window means of N − Weyl on [10,20) … [70,80)
        // lie within ±1.5 while the rms grows from 16 to 140 (the sphere's large degeneracies,
        // REFERENCE-VALUES.md §2c); |mean| ≤ 4 is asserted. The leading term alone leaves
        // means of −12 … −62, which the second assertion rules out.
        double[] ks = UNIT.modesUpTo(80.0).stream().mapToDouble(Mode::k).toArray();
        for (int w = 0; w < 7; w++) {
            double a = 10 + 10 * w;
            int steps = 4000;
            double sum = 0;
            double sumLead = 0;
            for (int i = 0; i < steps; i++) {
                double k = a + 10.0 * (i + 0.5) / steps;
                int n = CylinderCavityTest.countAtMost(ks, k);
                sum += n - UNIT.weylCount(k);
                sumLead += n - UNIT.volume() * k * k * k / (3 * Math.PI * Math.PI);
            }
            assertTrue(Math.abs(sum / steps) <= 4, "mean N − Weyl on [" + a + ", " + (a + 10) + ") = " + sum / steps);
            assertTrue(sumLead / steps < -8, "leading-term mean on [" + a + ", " + (a + 10) + ") = " + sumLead / steps);
        }
    }

    @Test
    void modesAreOrthonormalByQuadrature() {
        // Independent of the analytic normalisation: Gauss–Legendre in s (40 nodes, smooth
        // integrand, ks ≤ 6) and in cos θ (24 nodes, exact for the polynomial angular parts of degree
        // ≤ 8), uniform φ (32 nodes, exact for trigonometric degree < 32).
        List<Mode> modes = lowModes();
        assertEquals(23, modes.size());
        double[][] rr = ModeFieldChecks.legendre(40, 0, R);
        double[][] ct = ModeFieldChecks.legendre(24, -1, 1);
        int nPhi = 32;
        double[][][] g = ModeFieldChecks.gram(UNIT, modes, sink -> {
            for (int i = 0; i < rr[0].length; i++) {
                double s = rr[0][i];
                for (int j = 0; j < ct[0].length; j++) {
                    double cz = ct[0][j];
                    double sz = Math.sqrt(1 - cz * cz);
                    for (int k = 0; k < nPhi; k++) {
                        double phi = 2 * Math.PI * k / nPhi;
                        double w = rr[1][i] * s * s * ct[1][j] * (2 * Math.PI / nPhi);
                        sink.accept(new ModeFieldChecks.Node(R + s * sz * Math.cos(phi), R + s * sz * Math.sin(phi),
                            R + s * cz, w));
                    }
                }
            }
        });
        ModeFieldChecks.assertIdentity(g[0], modes, 1e-12, "(1/V)∫u·u'");
        ModeFieldChecks.assertIdentity(g[1], modes, 1e-12, "(1/V)∫h·h'");
    }

    @Test
    void wallConditionsHoldAtRandomWallPoints() {
        // n×u = 0 and n·h = 0 on r = R (PHYSICS.md §1), ~560 modes up to n ≈ 14, seeded points
        // uniform on the sphere plus both poles.
        List<Mode> modes = UNIT.modesUpTo(16.0);
        ModeFunctions f = UNIT.modeFunctions(modes);
        int m = modes.size();
        double[] u = new double[3 * m];
        double[] h = new double[3 * m];
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(424242L);
        for (int t = 0; t < 120; t++) {
            double cz = t == 0 ? 1 : t == 1 ? -1 : 2 * rng.nextDouble() - 1;
            double phi = 2 * Math.PI * rng.nextDouble();
            double sz = Math.sqrt(1 - cz * cz);
            double[] n = {sz * Math.cos(phi), sz * Math.sin(phi), cz};
            f.evaluate(R + R * n[0], R + R * n[1], R + R * n[2], u, h);
            for (int l = 0; l < m; l++) {
                int j = 3 * l;
                double cx = n[1] * u[j + 2] - n[2] * u[j + 1];
                double cy = n[2] * u[j] - n[0] * u[j + 2];
                double cw = n[0] * u[j + 1] - n[1] * u[j];
                double tangential = Math.sqrt(cx * cx + cy * cy + cw * cw);
                double normalH = n[0] * h[j] + n[1] * h[j + 1] + n[2] * h[j + 2];
                String at = modes.get(l).label() + " at direction (" + n[0] + ", " + n[1] + ", " + n[2] + ")";
                // The zeros carry ~1e-16 relative error; |u| reaches ~10 for n ≈ 14 near the wall.
                assertTrue(tangential < 1e-11, "|n×u| = " + tangential + " for " + at);
                assertTrue(Math.abs(normalH) < 1e-11, "n·h = " + normalH + " for " + at);
            }
        }
    }

    @Test
    void fieldsSatisfyMaxwellByFiniteDifferences() {
        // ∇·u = 0, ∇²u + k²u = 0, h = (1/k)∇×u by central differences at seeded points, some within
        // 1e-3 of the centre and some on the polar axis (where a spherical-coordinate form is 0/0).
        List<Mode> modes = lowModes();
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(99L);
        double[][] pts = new double[12][];
        for (int i = 0; i < pts.length; i++) {
            double s = i < 3 ? 1e-3 * rng.nextDouble() : 0.9 * R * Math.cbrt(rng.nextDouble());
            double cz = i == 3 ? 1 : i == 4 ? -1 : 2 * rng.nextDouble() - 1;
            double phi = 2 * Math.PI * rng.nextDouble();
            double sz = Math.sqrt(Math.max(0, 1 - cz * cz));
            pts[i] = new double[] {R + s * sz * Math.cos(phi), R + s * sz * Math.sin(phi), R + s * cz};
        }
        ModeFieldChecks.assertFieldEquations(UNIT, modes, pts);
    }

    @Test
    void centreAndPoleValuesAreFiniteAndContinuous() {
        // Removable singularities of the spherical form: finite values at the centre and on the
        // polar axis, within |∇u|·1e-9 ≲ 1e-8 of the values 1e-9 away (common practice).
        List<Mode> modes = UNIT.modesUpTo(12.0);
        ModeFunctions f = UNIT.modeFunctions(modes);
        double[][] bases = {{R, R, R}, {R, R, R + 0.6 * R}, {R, R, R - 0.3 * R}, {R, R, 2 * R}};
        double[][] dirs = {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {-0.6, 0.0, -0.8}, {0.48, -0.6, 0.64}};
        for (double[] b : bases) {
            for (boolean magnetic : new boolean[] {false, true}) {
                double[] at = ModeFieldChecks.eval(f, b[0], b[1], b[2], magnetic);
                for (double[] d : dirs) {
                    double[] near = ModeFieldChecks.eval(f, b[0] + 1e-9 * d[0], b[1] + 1e-9 * d[1], b[2] + 1e-9 * d[2],
                        magnetic);
                    for (int q = 0; q < at.length; q++) {
                        assertTrue(Double.isFinite(at[q]), "non-finite at " + b[2] + ": " + modes.get(q / 3).label());
                        assertEquals(at[q], near[q], 1e-7, modes.get(q / 3).label() + " component " + q % 3
                            + (magnetic ? " of h" : " of u") + " at z = " + b[2]);
                    }
                }
            }
        }
        // Only the n = 1 TM modes (u = N) and TE modes (h = N) are non-zero at the centre (j_n(0) = 0 for n ≥ 1, A&S 10.1.2).
        double[] u0 = ModeFieldChecks.eval(f, R, R, R, false);
        for (int l = 0; l < modes.size(); l++) {
            Mode m = modes.get(l);
            double mag = Math.abs(u0[3 * l]) + Math.abs(u0[3 * l + 1]) + Math.abs(u0[3 * l + 2]);
            if (m.i1() == 1 && m.family().equals("TM")) {
                assertTrue(mag > 0.1, m.label() + " should not vanish at the centre");
            } else {
                assertEquals(0.0, mag, 1e-15, m.label() + " should vanish at the centre");
            }
        }
    }

    @Test
    void fillingChangesOnlyTheFrequencies() {
        // PHYSICS.md §1: ω = ck/√(ε_r μ_r); TM1 of R = 0.1 m moves from 1.309117 GHz to /√(4·1).
        Cavity filled = SphericalCavity.of(0.1, new Medium(4.0, 1.0));
        Window window = new Window(Window.Kind.HARD, 2 * Math.PI * 1.0e9, Window.DEFAULT_TOLERANCE);
        ModeTable t = ModeTable.of(filled, window, ThermalState.VACUUM, 1000);
        assertEquals(1.309117e9 / 2, t.frequency(0), 0.6e3);
        assertEquals(8, t.size(), "TM1 (3) and TM2 (5) lie below 1 GHz when filled");
    }

    @Test
    void boundsAndContainsAgree() {
        Cavity c = SphericalCavity.of(0.1, Medium.VACUUM);
        Vec3[] b = c.bounds();
        assertEquals(new Vec3(0, 0, 0), b[0]);
        assertEquals(new Vec3(0.2, 0.2, 0.2), b[1]);
        assertTrue(c.contains(new Vec3(0.1, 0.1, 0.1)));
        assertTrue(c.contains(new Vec3(0.1, 0.1, 0.2)));
        assertTrue(c.contains(new Vec3(0.0, 0.1, 0.1)));
        assertFalse(c.contains(new Vec3(0.02, 0.02, 0.02)), "bounding-box corner is outside the sphere");
        assertEquals(4.0 / 3 * Math.PI * 1e-3, c.volume(), 1e-18);
    }

    @Test
    void rejectsBadRadiusNamingTheSetting() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SphericalCavity.of(0.0, Medium.VACUUM));
        assertTrue(e.getMessage().contains("cavity.radius_m") && e.getMessage().contains("0.0"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> UNIT.modeFunctions(List.of(new Mode("TE", 1, 1, 0, 3, 4.49))));
        assertThrows(IllegalArgumentException.class, () -> UNIT.modeFunctions(List.of(new Mode("TE", 0, 1, 0, 0, 3.14))));
    }

    @Test
    void yamlSpecRunsThroughThePipelineWithTheOutsideMasked() throws Exception {
        String yaml = String.join("\n",
            "cavity:",
            "  shape: sphere",
            "  radius_m: 0.1",
            "window:",
            "  kind: gauss",
            "  cutoff_GHz: 3",
            "  tolerance: 1.0e-3",
            "fields: [A, E, B]",
            "samples: 4",
            "seed: 5",
            "threads: 2",
            "evaluate:",
            "  points:",
            "    - name: centre",
            "      at: [0.1, 0.1, 0.1]",
            "  lines:",
            "    - name: diagonal",
            "      from: [0.0, 0.0, 0.0]",
            "      to: [0.2, 0.2, 0.2]",
            "      n: 9",
            "");
        ModeFieldChecks.PipelineResult r = ModeFieldChecks.runPipeline(yaml);
        assertEquals("sphere", r.spec().cavity().shape());
        ModeFieldChecks.assertMaskedInsideFinite(r);
    }
}
