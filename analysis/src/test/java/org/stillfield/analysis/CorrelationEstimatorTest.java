package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The correlation estimator on ensembles from the sampler, against the analytic mode sum.
 *
 * <p>False-failure budget: the suite allows ~1e-4 per CI run over all modules; this module's
 * stochastic checks take 2e-6 each (five of them: verdict pass here, the z² calibration, the
 * Isserlis Monte Carlo, the KS pass in AmplitudeCheckTest, and the KS critical values are exact),
 * 1e-5 in all. Power checks are set up so that missing the rejection has probability ≪ 1e-6.
 */
class CorrelationEstimatorTest {
    private static final long SEED = 20261201L;
    private static final double ALPHA = 2e-6;

    @Test
    void correctEnsemblePassesAgainstTheModeSum() throws IOException {
        // 20 000 samples of the 70-mode box; every row's estimate against the mode sum within the
        // Isserlis standard error (REFERENCE-VALUES.md §8; Isserlis 1918, source from memory).
        // False failure ≤ α = 2e-6 by Bonferroni over the 126 tested rows; with N = 2e4 the skewness
        // of each z is ~ 2√2/√N = 0.02, which changes the tail beyond z* = 5.6 by < 10 %.
        ModeTable table = EnsembleFixtures.tinyTable();
        assertEquals(70, table.size(), "mode count of the 1 x 1.3 x 1.7 box below k = 10 (REFERENCE-VALUES.md §4)");
        CorrelationEstimator est = new CorrelationEstimator(EnsembleFixtures.PAIRS, EnsembleFixtures.FIELDS, 4);
        EnsembleFixtures.run(table, SEED, 0, 20_000, est);
        CorrelationResult r = est.result(table, EnsembleFixtures.POINTS, ALPHA);
        assertEquals(20_000, r.samples());
        assertEquals(3 * 6 * 9, r.rows().size());
        // Zero-variance rows: pair (2,2) has 8 for A and E (only xx survives) and 5 for B (x row and
        // column); pair (1,2) has 6 for A and E (j = y, z) and 3 for B (j = x): 36 in all.
        assertEquals(36, r.zeroVarianceRows());
        assertEquals(126, r.verdict().tests());
        for (CorrelationRow row : r.rows()) {
            if (!row.tested()) {
                assertEquals(0.0, row.estimate(), "identically vanishing component must estimate exactly 0: " + row);
                assertEquals(0.0, row.z());
            }
        }
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
        assertTrue(r.verdict().passed(), String.format("seed %d, N = %d: worst |z| = %.3f > %.3f", SEED, r.samples(),
            r.verdict().worst(), r.verdict().threshold()));
    }

    @Test
    void ensembleWithTenPercentMoreVarianceFails() throws IOException {
        // Power: fields scaled by √1.1 (every variance 10 % too large). A diagonal row then has
        // E[z] = 0.1·√(N/2) = 10 at N = 2e4 against z* ≈ 5.6, so a pass needs every one of the
        // ~40 diagonal rows 4 σ low: probability ≪ 1e-6.
        ModeTable table = EnsembleFixtures.tinyTable();
        CorrelationEstimator est = new CorrelationEstimator(EnsembleFixtures.PAIRS, EnsembleFixtures.FIELDS, 4);
        EnsembleFixtures.run(table, SEED, 0, 20_000, EnsembleFixtures.scaled(est, Math.sqrt(1.1), 1.0));
        CorrelationResult r = est.result(table, EnsembleFixtures.POINTS, ALPHA);
        assertFalse(r.verdict().passed(), String.format("seed %d, N = %d: worst |z| = %.3f <= %.3f", SEED, r.samples(),
            r.verdict().worst(), r.verdict().threshold()));
        assertTrue(r.verdict().worst() > 7, "worst |z| " + r.verdict().worst());
    }

    @Test
    void zScoresHaveUnitVarianceAcrossReplicates() throws IOException {
        // The Isserlis standard error is the exact standard deviation of the estimator for Gaussian
        // data, so E[z²] = 1 on every tested row. 400 independent replicates of N = 50 samples: the
        // mean of z² over rows and replicates has standard deviation ≤ √(Var z²/400), Var z² ≤
        // 2 + 12/N = 2.24 (excess kurtosis of a product of normals ≤ 12, divided by N), i.e.
        // ≤ 0.075; tolerance 4.75 σ = 0.36 (two-sided 2e-6). A standard error off by √2 gives 0.5 or 2.
        ModeTable table = EnsembleFixtures.tinyTable();
        int replicates = 400;
        int n = 50;
        CorrelationEstimator[] est = new CorrelationEstimator[replicates];
        for (int k = 0; k < replicates; k++) {
            est[k] = new CorrelationEstimator(EnsembleFixtures.PAIRS, EnsembleFixtures.FIELDS, 4);
        }
        EnsembleSink split = batch -> {
            for (int s = 0; s < batch.size(); s++) {
                Map<Field, double[][]> v = new EnumMap<>(Field.class);
                for (Field f : batch.fields()) {
                    v.put(f, new double[][] {batch.values(f, s)});
                }
                long index = batch.firstSample() + s;
                est[(int) (index / n)].accept(new SampleBatch(index, new double[][] {batch.q(s)},
                    new double[][] {batch.e(s)}, v));
            }
        };
        EnsembleFixtures.run(table, SEED + 1, 0, (long) replicates * n, split);
        double sum = 0;
        long count = 0;
        for (CorrelationEstimator e : est) {
            CorrelationResult r = e.result(table, EnsembleFixtures.POINTS, ALPHA);
            assertFalse(r.warnings().isEmpty(), "N = 50 must carry the small-sample warning");
            for (CorrelationRow row : r.rows()) {
                if (row.tested()) {
                    sum += row.z() * row.z();
                    count++;
                }
            }
        }
        double mean = sum / count;
        assertEquals(1.0, mean, 0.36, String.format("seed %d, %d replicates of N = %d: mean z² = %.4f", SEED + 1,
            replicates, n, mean));
    }

    @Test
    void knownMeanCovarianceVarianceFollowsIsserlis() {
        // Var(ŝ_xy) = (σx²σy² + σxy²)/n for ŝ = (1/n)Σ x_i y_i of zero-mean bivariate normals
        // (Isserlis, Biometrika 12, 134 (1918), source from memory; REFERENCE-VALUES.md §8 quotes a
        // Monte Carlo with these parameters: n·Var = 1.1259 vs 1.1262). 2e5 replicates of n = 50:
        // the relative standard error of the variance estimate is √((κ − 1)/R) ≤ √(2.24/2e5) =
        // 0.34 % (κ ≤ 3 + 12/n), tolerance 4.75 σ = 1.6 % (two-sided 2e-6). The non-Isserlis forms
        // σx²σy² and σx²σy² + 2σxy² are 26 % away.
        long seed = 918L;
        UniformRandomProvider rng = RandomSource.L64_X128_MIX.create(seed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        double sx = 1.3;
        double sy = 0.7;
        double rho = 0.6;
        double sxy = rho * sx * sy;
        int n = 50;
        int reps = 200_000;
        double acc = 0;
        for (int k = 0; k < reps; k++) {
            double s = 0;
            for (int i = 0; i < n; i++) {
                double z1 = g.sample();
                double z2 = g.sample();
                double x = sx * z1;
                double y = sy * (rho * z1 + Math.sqrt(1 - rho * rho) * z2);
                s += x * y;
            }
            double d = s / n - sxy;
            acc += d * d;
        }
        double nVar = n * acc / reps;
        double isserlis = sx * sx * sy * sy + sxy * sxy;
        assertEquals(1.1262, isserlis, 1e-4, "REFERENCE-VALUES.md §8 value of σx²σy² + σxy²");
        assertEquals(isserlis, nVar, 0.016 * isserlis, String.format("seed %d, %d reps of n = %d: n·Var = %.5f", seed,
            reps, n, nVar));
    }

    @Test
    void smallEnsembleCarriesAWarning() throws IOException {
        ModeTable table = EnsembleFixtures.tinyTable();
        CorrelationEstimator est = new CorrelationEstimator(EnsembleFixtures.PAIRS, Set.of(Field.E), 4);
        EnsembleFixtures.run(table, SEED, 0, 20, est);
        CorrelationResult r = est.result(table, EnsembleFixtures.POINTS, 0.01);
        assertTrue(r.warnings().get(0).contains("only 20 samples"), r.warnings().toString());
    }

    @Test
    void criticalValueIsTheBonferroniNormalQuantile() {
        // Standard normal quantiles (common tabulated values, e.g. z_0.975 = 1.959964; recomputed
        // with scipy.stats.norm.isf): Φ⁻¹(1 − 0.05/2) = 1.9599640, Φ⁻¹(1 − 0.05/20) = 2.8070338,
        // Φ⁻¹(1 − 0.01/(2·1e5)) = 5.3267239. Tolerance 1e-7 (the digits given).
        assertEquals(1.9599640, CorrelationEstimator.criticalZ(0.05, 1), 1e-7);
        assertEquals(2.8070338, CorrelationEstimator.criticalZ(0.05, 10), 1e-7);
        assertEquals(5.3267239, CorrelationEstimator.criticalZ(0.01, 100_000), 1e-7);
    }

    @Test
    void nonzeroEstimateOnAVanishingComponentFails() throws IOException {
        // A correct ensemble gives exactly 0 where every mode function vanishes; a value there means
        // the field was synthesised wrongly, whatever its size.
        ModeTable table = EnsembleFixtures.tinyTable();
        CorrelationEstimator est = new CorrelationEstimator(List.of(new RunSpec.PointPair(2, 2)), Set.of(Field.E), 4);
        EnsembleSink corrupt = batch -> {
            for (int s = 0; s < batch.size(); s++) {
                batch.values(Field.E, s)[3 * 2 + 1] = 1e-30;
            }
            est.accept(batch);
        };
        EnsembleFixtures.run(table, SEED, 0, 200, corrupt);
        CorrelationResult r = est.result(table, EnsembleFixtures.POINTS, 0.01);
        assertFalse(r.verdict().passed());
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("nonzero estimate")), r.warnings().toString());
    }

    @Test
    void rejectsBadInput() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> new CorrelationEstimator(List.of(new RunSpec.PointPair(0, 4)), Set.of(Field.E), 4));
        assertTrue(ex.getMessage().contains("pairs[0]") && ex.getMessage().contains("0..3"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new CorrelationEstimator(List.of(), Set.of(), 4));
        CorrelationEstimator est = new CorrelationEstimator(EnsembleFixtures.PAIRS, Set.of(Field.E), 4);
        assertThrows(IllegalStateException.class, () -> est.result(EnsembleFixtures.tinyTable(), EnsembleFixtures.POINTS, 0.01));
        ex = assertThrows(IllegalArgumentException.class,
            () -> est.result(EnsembleFixtures.tinyTable(), EnsembleFixtures.POINTS, 1.5));
        assertTrue(ex.getMessage().contains("falseAlarm") && ex.getMessage().contains("1.5"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> est.accept(new SampleBatch(0, new double[1][70],
            new double[1][70], Map.of(Field.E, new double[1][9]))));
        assertTrue(ex.getMessage().contains("3 x 4 points"), ex.getMessage());
    }
}
