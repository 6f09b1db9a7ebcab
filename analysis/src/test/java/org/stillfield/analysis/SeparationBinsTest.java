package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.SeparationBin;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Separation-binned estimates on the 4 × 3 × 3 grid of the small box: bin means against the mode
 * sum, and the data-driven standard errors against the exact variance of the bin average.
 *
 * <p>The bin average of one sample is a quadratic form y = xᵀQx of the Gaussian point values x
 * (covariance Σ from the mode sum), so its cumulants are κ_r = 2^{r−1}(r−1)! tr((QΣ)^r) (standard
 * result for Gaussian quadratic forms, e.g. Mathai &amp; Provost, Quadratic Forms in Random
 * Variables, 1992; source from memory): mean tr(QΣ), variance 2tr((QΣ)²), and the sample variance s²
 * of N draws has variance (κ₄ + 2κ₂²)/N to leading order.
 *
 * <p>False-failure budget: 2e-6 for the bin means (Bonferroni over 2 × bins), and the sample
 * variance check at |z| &lt; 6 per entry (normal tail 2e-9 each; s² is right-skewed, skewness
 * ≈ 0.3 at N = 4000 here, which still keeps a 6σ excursion below ~1e-6 over all bins).
 */
class SeparationBinsTest {
    private static final long SEED = 20261204L;
    private static final int N = 4000;

    @Test
    void binMeansMatchTheModeSumAndErrorsMatchTheExactVariance() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        List<Vec3> all = spec.allPoints();
        List<Integer> grid = EstimatorFixtures.range(12, 48);
        SeparationBins bins = SeparationBins.byDistance(Field.E, grid, all);
        EstimatorFixtures.run(spec, table, SEED, 0, N, bins);
        List<SeparationBin> out = bins.result(table, FreeSpaceSpectrum.correlation(Field.E, table.window(),
            table.state(), table.cavity().medium()));
        assertEquals(bins.bins(), out.size());
        assertTrue(out.size() >= 6, "bins: " + out.size());
        double zStar = CorrelationEstimator.criticalZ(2e-6, 2 * out.size());
        int pairs = 0;
        for (SeparationBin b : out) {
            pairs += b.pairs();
            assertTrue(Math.abs(b.zParallel()) < zStar && Math.abs(b.zPerpendicular()) < zStar, String.format(
                "seed %d, N = %d, bin %s: z_par %.3f, z_perp %.3f, critical %.3f", SEED, N, b.label(), b.zParallel(),
                b.zPerpendicular(), zStar));
            assertTrue(b.meanM() >= b.lowM() && b.meanM() < b.highM(), "mean separation inside its bin: " + b);
            assertTrue(Double.isFinite(b.freeParallel()) && Double.isFinite(b.imageParallel()), "references: " + b);
        }
        assertEquals(36 * 35 / 2, pairs, "every pair of the grid is binned once");

        // Exact cumulants of each bin average from the mode-sum covariance of the 36 points.
        List<Vec3> pts = all.subList(12, 48);
        DMatrixRMaj sigma = ModeSumMatrix.covariance(table, Field.E, pts, new int[] {0, 1, 2});
        int dim = 3 * pts.size();
        double[] com = bins.moments().comoment();
        double[] mean = bins.moments().mean();
        for (int b = 0; b < out.size(); b++) {
            for (int proj = 0; proj < 2; proj++) {
                DMatrixRMaj q = new DMatrixRMaj(dim, dim);
                int m = 0;
                for (int p = 0; p < pts.size(); p++) {
                    for (int r = p + 1; r < pts.size(); r++) {
                        double dist = pts.get(r).minus(pts.get(p)).norm();
                        if (dist < out.get(b).lowM() || dist >= out.get(b).highM()) {
                            continue;
                        }
                        m++;
                        Vec3 d = pts.get(r).minus(pts.get(p));
                        double[] u = {d.x() / dist, d.y() / dist, d.z() / dist};
                        for (int i = 0; i < 3; i++) {
                            for (int j = 0; j < 3; j++) {
                                double par = u[i] * u[j];
                                double w = proj == 0 ? par : 0.5 * ((i == j ? 1 : 0) - par);
                                q.add(3 * p + i, 3 * r + j, 0.5 * w);
                                q.add(3 * r + j, 3 * p + i, 0.5 * w);
                            }
                        }
                    }
                }
                CommonOps_DDRM.scale(1.0 / m, q);
                DMatrixRMaj qs = new DMatrixRMaj(dim, dim);
                CommonOps_DDRM.mult(q, sigma, qs);
                DMatrixRMaj qs2 = new DMatrixRMaj(dim, dim);
                CommonOps_DDRM.mult(qs, qs, qs2);
                DMatrixRMaj qs4 = new DMatrixRMaj(dim, dim);
                CommonOps_DDRM.mult(qs2, qs2, qs4);
                double k1 = CommonOps_DDRM.trace(qs);
                double k2 = 2 * CommonOps_DDRM.trace(qs2);
                double k4 = 48 * CommonOps_DDRM.trace(qs4);
                SeparationBin bin = out.get(b);
                double modeSum = proj == 0 ? bin.modeSumParallel() : bin.modeSumPerpendicular();
                assertEquals(k1, modeSum, 1e-12 * Math.sqrt(k2), "tr(QΣ) is the bin's mode-sum average");
                int at = 2 * b + proj;
                double s2 = com[at * (2 * out.size()) + at] / (N - 1);
                double z = (s2 - k2) / Math.sqrt((k4 + 2 * k2 * k2) / N);
                assertTrue(Math.abs(z) < 6, String.format("seed %d, N = %d, bin %s proj %d: s^2 = %.5g vs exact %.5g (z %.2f)",
                    SEED, N, bin.label(), proj, s2, k2, z));
                double se = proj == 0 ? bin.parallelSe() : bin.perpendicularSe();
                assertEquals(Math.sqrt(s2 / N), se, 1e-12 * se, "standard error = s/sqrt(N)");
                assertEquals(mean[at], proj == 0 ? bin.parallel() : bin.perpendicular(), 0.0);
            }
        }
    }

    @Test
    void vectorBinsGroupPairsByOffset() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        SeparationBins bins = SeparationBins.byVector(Field.B, EstimatorFixtures.range(12, 48), spec.allPoints(), 0.01);
        // Offsets (Δi, Δj, Δk) of a 4 × 3 × 3 grid up to sign: (7·5·5 − 1)/2 = 87.
        assertEquals(87, bins.bins());
        EstimatorFixtures.run(spec, table, SEED, 0, 50, bins);
        List<SeparationBin> out = bins.result(table, null);
        for (int k = 1; k < out.size(); k++) {
            assertTrue(out.get(k).lowM() >= out.get(k - 1).lowM(), "bins sorted by length");
        }
        assertTrue(Double.isNaN(out.get(0).freeParallel()), "no free-space reference when none is given");
        assertThrows(IllegalArgumentException.class, () -> SeparationBins.byVector(Field.B, List.of(1, 2),
            spec.allPoints(), 0));
        assertThrows(IllegalArgumentException.class, () -> SeparationBins.byDistance(Field.B, List.of(1),
            spec.allPoints()));
        assertThrows(IllegalArgumentException.class, () -> SeparationBins.byDistance(Field.B, List.of(1, 2),
            spec.allPoints(), new double[] {0.5, 0.2}));
    }
}
