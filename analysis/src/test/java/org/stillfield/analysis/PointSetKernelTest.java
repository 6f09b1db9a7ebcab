package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import org.apache.commons.math3.distribution.TDistribution;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The point-set kernel K = Σ⁺/ΔV² (derivation in {@link PointSetKernel}) on a cell-centred 5 × 5 × 5
 * grid of the unit cube with the modes up to k = 4.5π (every mode index ≤ 4 &lt; 5, so the grid is an
 * exact quadrature): against the mode-space kernel Σ_l u u/(V²σ²) exactly, and from samples with
 * the inverse-Wishart correction.
 *
 * <p>False-failure budget: 1e-6 for the sampled check (Bonferroni over 3 t-tests with 7 degrees of
 * freedom from 8 independent replicate groups).
 */
class PointSetKernelTest {
    private static final long SEED = 20261207L;
    private static final Window WINDOW = new Window(Window.Kind.HARD, 4.5 * Math.PI * Medium.VACUUM.waveSpeed(),
        Window.DEFAULT_TOLERANCE);

    private static ModeTable table() {
        return ModeTable.of(RectangularCavity.of(1, 1, 1, Medium.VACUUM), WINDOW, ThermalState.VACUUM, 10_000);
    }

    private static PointSet grid() {
        return PointSet.grid("g", Vec3.ZERO, new Vec3(1, 1, 1), 5, 5, 5);
    }

    private static DMatrixRMaj modeKernel(ModeTable t, List<Vec3> pts) {
        double[] w = ModeSpaceKernel.of(t, Field.E, k -> 1.0, "none").exactWeights();
        return ModeSumMatrix.of(t, Field.E, pts, new int[] {0, 1, 2}, w);
    }

    private static double maxAbs(DMatrixRMaj m) {
        return CommonOps_DDRM.elementMaxAbs(m);
    }

    @Test
    void pseudoInverseOverCellVolumeSquaredIsTheModeKernelOnAQuadratureGrid() {
        ModeTable t = table();
        int m = t.size();
        for (int l = 0; l < m; l++) {
            var mode = t.modes().get(l);
            assertTrue(Math.max(mode.i1(), Math.max(mode.i2(), mode.i3())) <= 4, "mode indices below the grid size");
        }
        List<Vec3> pts = grid().points();
        DMatrixRMaj sigma = ModeSumMatrix.covariance(t, Field.E, pts, new int[] {0, 1, 2});
        double dv = 1.0 / 125;
        PointSetKernel.Result k = PointSetKernel.truncated(sigma, m, dv, 0);
        DMatrixRMaj want = modeKernel(t, pts);
        DMatrixRMaj diff = k.kernel().copy();
        CommonOps_DDRM.subtractEquals(diff, want);
        assertTrue(maxAbs(diff) < 1e-9 * maxAbs(want), "relative difference " + maxAbs(diff) / maxAbs(want));
        // The spectrum has exactly M positive eigenvalues: the sampled transverse subspace.
        assertTrue(k.eigenvalues()[m] < 1e-12 * k.eigenvalues()[0], "gap after M = " + m);

        // Tikhonov with λ far below the spectrum reproduces the same kernel to O((λ/λ_min)²).
        double lambda = 1e-4 * k.eigenvalues()[m - 1];
        DMatrixRMaj tk = PointSetKernel.tikhonov(sigma, lambda, dv).kernel();
        CommonOps_DDRM.subtractEquals(tk, want);
        assertTrue(maxAbs(tk) < 1e-6 * maxAbs(want), "Tikhonov relative difference " + maxAbs(tk) / maxAbs(want));
    }

    @Test
    void withoutTheQuadratureTheRelationFails() {
        // Jittered points are no quadrature: Σ⁺/ΔV² then differs from the mode kernel at the points.
        ModeTable t = table();
        List<Vec3> pts = new ArrayList<>();
        int k = 0;
        for (Vec3 p : grid().points()) {
            double j = 0.03 * Math.sin(7.1 * k++);
            pts.add(new Vec3(p.x() + j, p.y() - 0.5 * j, p.z() + 0.7 * j));
        }
        DMatrixRMaj sigma = ModeSumMatrix.covariance(t, Field.E, pts, new int[] {0, 1, 2});
        DMatrixRMaj got = PointSetKernel.truncated(sigma, t.size(), 1.0 / 125, 0).kernel();
        DMatrixRMaj want = modeKernel(t, pts);
        CommonOps_DDRM.subtractEquals(got, want);
        assertTrue(maxAbs(got) > 1e-3 * maxAbs(want), "relative difference " + maxAbs(got) / maxAbs(want));
    }

    @Test
    void sampledKernelIsUnbiasedWithTheInverseWishartFactor() throws IOException {
        // 8 independent groups of 600 samples; per group K̂ = ((N − M − 1)/N) S⁺_M/ΔV². Checked: tr(K̂Σ)ΔV²
        // (exactly M in expectation), the mean diagonal and the mean nearest-neighbour xx entry
        // against the exact kernel. Without the factor the bias would be (M + 1)/N ≈ 15 %.
        ModeTable t = table();
        int m = t.size();
        PointSet g = grid();
        List<Vec3> pts = g.points();
        int p = 3 * pts.size();
        double dv = 1.0 / 125;
        DMatrixRMaj sigma = ModeSumMatrix.covariance(t, Field.E, pts, new int[] {0, 1, 2});
        DMatrixRMaj exact = modeKernel(t, pts);
        int groups = 8;
        int n = 600;
        double[][] stat = new double[3][groups];
        double[] want = {m, meanDiagonal(exact), meanNeighbourXx(exact)};
        for (int gi = 0; gi < groups; gi++) {
            MomentAccumulator acc = MomentAccumulator.of(p);
            EnsembleRunner.run(new EnsembleRunner.Plan(t, pts, Set.of(Field.E), SEED, (long) gi * n, n, 2), List.of(g),
                batch -> {
                    double[][] rows = new double[batch.size()][];
                    for (int s = 0; s < batch.size(); s++) {
                        rows[s] = batch.values(Field.E, s);
                    }
                    acc.addAll(rows, rows.length);
                }, null);
            DMatrixRMaj s = PointSetKernel.matrix(acc.secondMoment(), p);
            DMatrixRMaj k = PointSetKernel.truncated(s, m, dv, n).kernel();
            DMatrixRMaj ks = new DMatrixRMaj(p, p);
            CommonOps_DDRM.mult(k, sigma, ks);
            stat[0][gi] = CommonOps_DDRM.trace(ks) * dv * dv;
            stat[1][gi] = meanDiagonal(k);
            stat[2][gi] = meanNeighbourXx(k);
        }
        double tStar = new TDistribution(null, groups - 1).inverseCumulativeProbability(1 - 1e-6 / 6);
        String[] names = {"tr(K Sigma) dV^2", "mean diagonal", "mean neighbour xx"};
        for (int q = 0; q < 3; q++) {
            double mean = 0;
            for (double v : stat[q]) {
                mean += v / groups;
            }
            double var = 0;
            for (double v : stat[q]) {
                var += (v - mean) * (v - mean) / (groups - 1);
            }
            double tval = (mean - want[q]) / Math.sqrt(var / groups);
            assertTrue(Math.abs(tval) < tStar, String.format("seed %d, %d x %d samples, %s: mean %.6g vs %.6g, t = %.2f"
                + " (critical %.2f)", SEED, groups, n, names[q], mean, want[q], tval, tStar));
            // The test has power: the uncorrected estimate would sit (M + 1)/(N − M − 1) higher.
            double biased = mean * n / (n - m - 1);
            assertTrue(Math.abs(biased - want[q]) / Math.sqrt(var / groups) > tStar, "power against the bias: " + names[q]);
        }
        assertThrows(IllegalArgumentException.class, () -> PointSetKernel.truncated(sigma, m, dv, m + 1));
    }

    private static double meanDiagonal(DMatrixRMaj k) {
        return CommonOps_DDRM.trace(k) / k.numRows;
    }

    /** Mean K_xx(p, p + x̂Δ) over the grid's x-neighbours (x index fastest). */
    private static double meanNeighbourXx(DMatrixRMaj k) {
        double sum = 0;
        int count = 0;
        for (int p = 0; p < 125; p++) {
            if (p % 5 < 4) {
                sum += k.get(3 * p, 3 * (p + 1));
                count++;
            }
        }
        return sum / count;
    }
}
