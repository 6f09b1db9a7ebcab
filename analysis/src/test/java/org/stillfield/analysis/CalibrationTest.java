package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.EnumSet;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The real false-alarm rate of the verdicts under the null, over 1000 independent seeds of a small
 * run (the 1 × 1.3 × 1.7 m box below k = 8 rad/m, 200 samples per seed), at nominal α = 0.1.
 *
 * <ul>
 *   <li>The Gaussianity verdict (Holm over nearly independent statistics) must reject at the
 *       nominal rate: the count lies within 5 binomial standard deviations of 1000·α (two-sided
 *       false failure ≈ 6e-7 by the normal approximation of Binomial(1000, 0.1)). With K = 36 nearly
 *       independent tests the exact rate would be 1 − (1 − α/K)^K = 0.0952, 0.5 SD below α.</li>
 *   <li>The run's verdict (correlation table at α/2, Bonferroni over correlated rows, plus the
 *       pooled amplitude KS test at α/2) may only be conservative: its count must not exceed
 *       1000·α by more than 5 SD (one-sided, 3e-7).</li>
 * </ul>
 */
class CalibrationTest {
    private static final int SEEDS = 1000;
    private static final int N = 200;
    private static final double ALPHA = 0.1;

    @Test
    void falseAlarmRatesMatchTheNominalRate() throws Exception {
        Medium vac = Medium.VACUUM;
        ModeTable table = ModeTable.of(RectangularCavity.of(1.0, 1.3, 1.7, vac),
            new Window(Window.Kind.HARD, 8 * vac.waveSpeed(), Window.DEFAULT_TOLERANCE), ThermalState.VACUUM, 10_000);
        List<Vec3> points = List.of(new Vec3(0.31, 0.55, 0.8), new Vec3(0.62, 0.71, 1.1), new Vec3(0.45, 0.2, 0.4));
        List<RunSpec.PointPair> pairs = List.of(new RunSpec.PointPair(0, 0), new RunSpec.PointPair(0, 1),
            new RunSpec.PointPair(1, 1), new RunSpec.PointPair(1, 2), new RunSpec.PointPair(2, 2));
        int gaussFail = 0;
        int runFail = 0;
        for (int s = 0; s < SEEDS; s++) {
            long seed = 7_000_000L + s;
            GaussianityCheck g = GaussianityCheck.of(table, Field.E, List.of(0, 1), points, 16, 1000);
            CorrelationEstimator est = new CorrelationEstimator(pairs, EnumSet.of(Field.E, Field.B), 3);
            AmplitudeCheck amp = new AmplitudeCheck(table);
            EnsembleRunner.run(new EnsembleRunner.Plan(table, points, EnumSet.of(Field.E, Field.B), seed, 0, N, 1),
                EstimatorFixtures.tee(g, est, amp), null);
            if (!g.result(ALPHA).verdict().passed()) {
                gaussFail++;
            }
            Verdict run = Verdicts.combine(ALPHA, est.result(table, points, ALPHA / 2).verdict(), amp.verdict(ALPHA / 2));
            if (!run.passed()) {
                runFail++;
            }
        }
        double mean = SEEDS * ALPHA;
        double sd = Math.sqrt(SEEDS * ALPHA * (1 - ALPHA));
        assertTrue(Math.abs(gaussFail - mean) <= 5 * sd, String.format(
            "Gaussianity verdict: %d of %d seeds (7000000..) rejected at alpha = %.2f, expected %.0f +- %.1f",
            gaussFail, SEEDS, ALPHA, mean, sd));
        assertTrue(runFail <= mean + 5 * sd, String.format(
            "run verdict: %d of %d seeds rejected at alpha = %.2f, nominal %.0f +- %.1f", runFail, SEEDS, ALPHA, mean, sd));
    }
}
