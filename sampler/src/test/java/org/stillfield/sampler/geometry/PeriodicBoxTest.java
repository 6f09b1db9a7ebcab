package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.Vec3;

class PeriodicBoxTest {
    private static final double LX = 1.0;
    private static final double LY = 1.3;
    private static final double LZ = 1.7;
    private static final Cavity BOX = PeriodicBox.of(LX, LY, LZ, Medium.VACUUM);

    @Test
    void modesAreOrthonormalOnAUniformGrid() {
        // A uniform N-point grid per period integrates e^{iqx} exactly for |q| < N (common practice);
        // products of two modes with |n| ≤ 3 have |q| ≤ 6 < 8.
        List<Mode> modes = BOX.modesUpTo(7.5);
        assertTrue(modes.size() >= 20 && modes.size() <= 80, "mode count " + modes.size());
        int n = 8;
        double w = BOX.volume() / (n * n * n);
        double[][][] g = ModeFieldChecks.gram(BOX, modes, sink -> {
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    for (int k = 0; k < n; k++) {
                        sink.accept(new ModeFieldChecks.Node(LX * (i + 0.3) / n, LY * (j + 0.7) / n, LZ * (k + 0.1) / n, w));
                    }
                }
            }
        });
        ModeFieldChecks.assertIdentity(g[0], modes, 1e-13, "(1/V)∫u·u'");
        ModeFieldChecks.assertIdentity(g[1], modes, 1e-13, "(1/V)∫h·h'");
    }

    @Test
    void modeFunctionsArePeriodic() {
        List<Mode> modes = BOX.modesUpTo(20.0);
        ModeFunctions f = BOX.modeFunctions(modes);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(31L);
        for (int t = 0; t < 20; t++) {
            double x = LX * rng.nextDouble();
            double y = LY * rng.nextDouble();
            double z = LZ * rng.nextDouble();
            double[][] shifted = {{x + LX, y, z}, {x, y - LY, z}, {x, y, z + LZ}};
            for (boolean magnetic : new boolean[] {false, true}) {
                double[] a = ModeFieldChecks.eval(f, x, y, z, magnetic);
                for (double[] s : shifted) {
                    double[] b = ModeFieldChecks.eval(f, s[0], s[1], s[2], magnetic);
                    for (int q = 0; q < a.length; q++) {
                        // Phase k·L = 2πn is exact only to rounding of ~|k·r|·ε ≈ 1e-14.
                        assertEquals(a[q], b[q], 1e-12, modes.get(q / 3).label());
                    }
                }
            }
        }
    }

    @Test
    void fieldsSatisfyMaxwellByFiniteDifferences() {
        List<Mode> modes = BOX.modesUpTo(7.5);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(5L);
        double[][] pts = new double[8][];
        for (int i = 0; i < pts.length; i++) {
            // Any point, even on the faces: the box has no walls.
            pts[i] = new double[] {LX * rng.nextDouble(), LY * rng.nextDouble(), i == 0 ? 0.0 : LZ * rng.nextDouble()};
        }
        ModeFieldChecks.assertFieldEquations(BOX, modes, pts);
    }

    @Test
    void modeCountIsTwicePerLatticePointCountedIndependently() {
        // Brute-force count over the full reciprocal lattice (no half-space rule): two
        // polarisations per k ≠ 0 with |k| ≤ kMax.
        for (double kMax : new double[] {4.0, 9.5, 17.0}) {
            int lattice = 0;
            int nMax = (int) Math.ceil(kMax * LZ / (2 * Math.PI)) + 1;
            for (int i = -nMax; i <= nMax; i++) {
                for (int j = -nMax; j <= nMax; j++) {
                    for (int k = -nMax; k <= nMax; k++) {
                        double kx = 2 * Math.PI * i / LX;
                        double ky = 2 * Math.PI * j / LY;
                        double kz = 2 * Math.PI * k / LZ;
                        double kk = Math.sqrt(kx * kx + ky * ky + kz * kz);
                        if (kk > 0 && kk <= kMax) {
                            lattice++;
                        }
                    }
                }
            }
            assertEquals(2 * lattice, BOX.modesUpTo(kMax).size(), "kMax = " + kMax);
        }
        assertEquals(2 * Math.PI / LZ, BOX.lowestK(), 1e-15);
        assertEquals(2 * Math.PI / LZ, BOX.modesUpTo(4.0).get(0).k(), 1e-15);
    }

    @Test
    void windowAveragedCountFollowsWeyl() {
        // Empirical bound: for this box the window means of N − (Vk³/(3π²) − 2) on [5,60) lie
        // within ±1.2 (rms 7 … 43, lattice-point fluctuations); |mean| ≤ 3 is asserted.
        double[] ks = BOX.modesUpTo(60.0).stream().mapToDouble(Mode::k).toArray();
        for (int w = 0; w < 5; w++) {
            double a = 5 + 11 * w;
            int steps = 2000;
            double sum = 0;
            for (int i = 0; i < steps; i++) {
                double k = a + 11.0 * (i + 0.5) / steps;
                sum += CylinderCavityTest.countAtMost(ks, k) - BOX.weylCount(k);
            }
            assertTrue(Math.abs(sum / steps) <= 3, "mean N − Weyl on [" + a + ", " + (a + 11) + ") = " + sum / steps);
        }
    }

    /**
     * Free-space C^E_ij(r) with the exponential window, in units of ħc/ε0 (PHYSICS.md §4):
     * (1/π²)[δ_ij(1/s² − 2r²/s³) + 2x_ix_j/s³], s = r² + a².
     */
    private static double freeSpaceE(double[] x, int i, int j, double a) {
        double r2 = x[0] * x[0] + x[1] * x[1] + x[2] * x[2];
        double s = r2 + a * a;
        double v = 2 * x[i] * x[j] / (s * s * s);
        if (i == j) {
            v += 1 / (s * s) - 2 * r2 / (s * s * s);
        }
        return v / (Math.PI * Math.PI);
    }

    @Test
    void electricCorrelationEqualsThePeriodicImageSumOfTheFreeSpaceKernel() {
        // C^E_ij(r,r') = Σ_l W_l σ_E,l² u_l,i(r) u_l,j(r') (PHYSICS.md §4), W = e^{−ka}, σ_E² = ħck/(2ε0V),
        // must equal Σ_n C^E_free(r − r' + n∘L) (Poisson summation; the k = 0 term carries weight k = 0).
        // Units ħc/ε0. a = 0.25: modes with e^{−ka} < 1e-12 are dropped (tail ≈ 3e-7 of C(0) = 26).
        // Images with |Δ + n∘L| ≤ 30 are summed directly; beyond, the angular average
        // (4/π)[1/s² − (4/3)ρ²/s³]δ_ij is integrated (the neglected lattice-point discrepancy on the
        // cut-off sphere is ~1e-5 absolute). Tolerance 1e-4 absolute.
        double a = 0.25;
        double kMax = Math.log(1e12) / a;
        List<Mode> modes = BOX.modesUpTo(kMax);
        ModeFunctions f = BOX.modeFunctions(modes);
        double[] r = {0.41, 0.77, 1.23};
        double[][] others = {r, {0.71, 0.97, 1.13}, {0.05, 1.25, 0.2}};
        double[] ur = ModeFieldChecks.eval(f, r[0], r[1], r[2], false);
        double rhoCut = 30.0;
        double tail = tailIntegral(a, rhoCut) / BOX.volume();
        for (double[] r2 : others) {
            double[] ur2 = ModeFieldChecks.eval(f, r2[0], r2[1], r2[2], false);
            double[][] modeSum = new double[3][3];
            for (int l = 0; l < modes.size(); l++) {
                double k = modes.get(l).k();
                double weight = Math.exp(-k * a) * k / (2 * BOX.volume());
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        modeSum[i][j] += weight * ur[3 * l + i] * ur2[3 * l + j];
                    }
                }
            }
            double[] delta = {r[0] - r2[0], r[1] - r2[1], r[2] - r2[2]};
            double[][] images = new double[3][3];
            int nx = (int) (rhoCut / LX) + 2;
            int ny = (int) (rhoCut / LY) + 2;
            int nz = (int) (rhoCut / LZ) + 2;
            double[] x = new double[3];
            for (int i = -nx; i <= nx; i++) {
                for (int j = -ny; j <= ny; j++) {
                    for (int k = -nz; k <= nz; k++) {
                        x[0] = delta[0] + i * LX;
                        x[1] = delta[1] + j * LY;
                        x[2] = delta[2] + k * LZ;
                        if (x[0] * x[0] + x[1] * x[1] + x[2] * x[2] > rhoCut * rhoCut) {
                            continue;
                        }
                        for (int p = 0; p < 3; p++) {
                            for (int q = 0; q < 3; q++) {
                                images[p][q] += freeSpaceE(x, p, q, a);
                            }
                        }
                    }
                }
            }
            for (int p = 0; p < 3; p++) {
                images[p][p] += tail;
                for (int q = 0; q < 3; q++) {
                    assertEquals(images[p][q], modeSum[p][q], 1e-4, "C^E_" + p + q + " for r' = (" + r2[0] + ", " + r2[1] + ", "
                        + r2[2] + "), " + modes.size() + " modes");
                }
            }
        }
        // The self term dominates at r = r': C^E(0) = δ/(π²a⁴) ≈ 25.9 per component (PHYSICS.md §4).
        assertTrue(Math.abs(1 / (Math.PI * Math.PI * Math.pow(a, 4)) - 25.94) < 0.01);
    }

    /** ∫_{ρ>ρc} (4/π)[1/s² − (4/3)ρ²/s³] ρ² dρ with t = 1/ρ, by Gauss–Legendre (smooth in t). */
    private static double tailIntegral(double a, double rhoCut) {
        GaussIntegrator g = new GaussIntegratorFactory().legendre(40, 0.0, 1.0 / rhoCut);
        return g.integrate(t -> {
            double rho2 = 1 / (t * t);
            double s = rho2 + a * a;
            double integrand = rho2 * (1 / (s * s) - 4.0 / 3.0 * rho2 / (s * s * s));
            return 4 / Math.PI * integrand / (t * t);
        });
    }

    @Test
    void boundsContainsAndParameters() {
        Vec3[] b = BOX.bounds();
        assertEquals(new Vec3(LX, LY, LZ), b[1]);
        assertTrue(BOX.contains(new Vec3(0, 0, 0)));
        assertTrue(BOX.contains(new Vec3(LX, LY, LZ)));
        assertFalse(BOX.contains(new Vec3(-1e-9, 0.5, 0.5)));
        assertEquals(List.of("lx_m", "ly_m", "lz_m"), List.copyOf(BOX.parameters().keySet()));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> PeriodicBox.of(1, -2, 1, Medium.VACUUM));
        assertTrue(e.getMessage().contains("cavity.ly_m") && e.getMessage().contains("-2.0"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> BOX.modeFunctions(List.of(new Mode("COS", -1, 0, 0, 0, 6.28))));
        assertThrows(IllegalArgumentException.class, () -> BOX.modeFunctions(List.of(new Mode("TE", 1, 0, 0, 0, 6.28))));
    }

    @Test
    void yamlSpecRunsThroughThePipeline() throws Exception {
        // The torus has no outside within its bounds: every point carries a finite field.
        String yaml = String.join("\n",
            "cavity:",
            "  shape: periodic",
            "  lx_m: 0.02",
            "  ly_m: 0.03",
            "  lz_m: 0.025",
            "  eps_r: 2.0",
            "window:",
            "  kind: hard",
            "  cutoff_GHz: 40",
            "samples: 3",
            "seed: 17",
            "threads: 1",
            "evaluate:",
            "  grids:",
            "    - name: all",
            "      n: [3, 2, 2]",
            "");
        ModeFieldChecks.PipelineResult r = ModeFieldChecks.runPipeline(yaml);
        assertEquals("periodic", r.spec().cavity().shape());
        ModeFieldChecks.assertMaskedInsideFinite(r, false);
    }
}
