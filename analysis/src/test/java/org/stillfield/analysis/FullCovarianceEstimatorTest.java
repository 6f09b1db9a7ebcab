package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The full pair covariance of a line: its mode-sum matrix against the pairwise mode sum, its
 * estimates against the independent estimator of fixed pairs, and its verdict on a correct
 * ensemble.
 *
 * <p>False-failure budget (module total ~1e-5 of the suite's 1e-4): 2e-6 for the verdict here.
 */
class FullCovarianceEstimatorTest {
    private static final long SEED = 20261203L;

    @Test
    void modeSumMatrixAgreesWithThePairwiseModeSum() throws Exception {
        // Two implementations of Σ_l w_l f_l,i(r) f_l,j(r′): blocked matrix product vs chunked per-pair sums.
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        List<Vec3> line = spec.pointSets().get(1).points();
        for (Field f : Field.values()) {
            DMatrixRMaj m = ModeSumMatrix.covariance(table, f, line, new int[] {0, 1, 2});
            ModeSumCorrelation ms = ModeSumCorrelation.of(table, line);
            double scale = 0;
            for (int k = 0; k < m.getNumElements(); k++) {
                scale = Math.max(scale, Math.abs(m.data[k]));
            }
            for (int a = 0; a < line.size(); a += 3) {
                for (int b = 0; b < line.size(); b += 2) {
                    double[][] t = ms.tensor(f, a, b);
                    for (int i = 0; i < 3; i++) {
                        for (int j = 0; j < 3; j++) {
                            assertEquals(t[i][j], m.get(3 * a + i, 3 * b + j), 1e-13 * scale,
                                f + " (" + a + "," + b + ")[" + i + "," + j + "]");
                        }
                    }
                }
            }
        }
    }

    @Test
    void correctEnsemblePassesAndAgreesWithTheFixedPairEstimator() throws Exception {
        // 4000 samples; 561 rows per field (66 pairs a <= b of the 11-point line). False failure
        // <= α = 2e-6 by Bonferroni over all tested rows of the three fields (each verdict at α/3).
        // With N = 4000 the skewness of each z is ~ 2√2/√N = 0.045, well within the normal tail.
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        int pc = spec.allPoints().size();
        List<Integer> line = EstimatorFixtures.range(1, 12);
        List<FullCovarianceEstimator> full = new ArrayList<>();
        for (Field f : Field.values()) {
            full.add(FullCovarianceEstimator.of(f, line, pc));
        }
        List<RunSpec.PointPair> pairs = new ArrayList<>();
        for (int b = 1; b < 12; b++) {
            pairs.add(new RunSpec.PointPair(6, b));
        }
        CorrelationEstimator fixed = new CorrelationEstimator(pairs, EnumSet.allOf(Field.class), pc);
        EstimatorFixtures.run(spec, table, SEED, 0, 4000, EstimatorFixtures.tee(fixed,
            EstimatorFixtures.tee(full.toArray(new FullCovarianceEstimator[0]))));
        for (FullCovarianceEstimator est : full) {
            CorrelationResult r = est.result(table, spec.allPoints(), 2e-6 / 3);
            assertEquals(561, r.rows().size(), "rows for " + est.field());
            assertTrue(r.verdict().passed(), String.format("seed %d, N = %d, %s: worst |z| = %.3f > %.3f (%s)", SEED,
                r.samples(), est.field(), r.verdict().worst(), r.verdict().threshold(), r.warnings()));
            // Same estimator, independent accumulation (Neumaier sums of products there, Chan's
            // co-moment update here): equal to rounding.
            for (int b = 0; b < 11; b++) {
                double[][] x = est.tensor(5, b);
                double[][] y = fixed.estimate(est.field(), b);
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        double scale = Math.abs(fixed.estimate(est.field(), 5)[i][i]) + Math.abs(y[i][j]);
                        assertEquals(y[i][j], x[i][j], 1e-12 * scale, est.field() + " pair (6," + (b + 1) + ")");
                    }
                }
            }
            long zeroRows = r.rows().stream().filter(row -> !row.tested()).count();
            for (CorrelationRow row : r.rows()) {
                if (!row.tested()) {
                    assertEquals(0.0, row.estimate(), "identically vanishing component: " + row);
                }
            }
            assertTrue(zeroRows > 0, "the line starts on the wall x = 0, where components vanish: " + est.field());
        }
    }

    @Test
    void refusesAChoiceAboveTheSizeLimit() {
        List<Integer> pts = EstimatorFixtures.range(0, 48);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> FullCovarianceEstimator.of(Field.E, pts, new int[] {0, 1, 2}, 48, 100));
        assertTrue(ex.getMessage().contains("144") && ex.getMessage().contains("100"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> FullCovarianceEstimator.of(Field.E, List.of(1, 1), 48));
        assertThrows(IllegalArgumentException.class, () -> FullCovarianceEstimator.of(Field.E, List.of(48), 48));
        assertThrows(IllegalArgumentException.class,
            () -> FullCovarianceEstimator.of(Field.E, List.of(1), new int[] {0, 0}, 48, 100));
    }
}
