package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.special.Erf;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.GaussianityResult;
import org.stillfield.analysis.api.NormalityTest;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The Gaussianity and independence family on the small box: a correct ensemble passes; variances
 * 3 % too large, one non-Gaussian mode, and two correlated modes are each rejected.
 *
 * <p>False-failure budget: 1e-6 for the pass (α of the verdict). Power cases are set up so that
 * a miss has probability ≪ 1e-6 (arithmetic beside each).
 */
class GaussianityCheckTest {
    private static final long SEED = 20261209L;
    private static final int N = 2000;

    private static GaussianityCheck check(RunSpec spec, ModeTable table) {
        // Mardia on E at the probe and two interior line points (p = 9).
        return GaussianityCheck.of(table, Field.E, List.of(0, 4, 8), spec.allPoints(), 16, 10_000);
    }

    /** Forwards batches after changing amplitudes of some modes. */
    private static EnsembleSink tamper(EnsembleSink target, java.util.function.BiConsumer<double[], double[]> f) {
        return batch -> {
            int n = batch.size();
            double[][] q = new double[n][];
            double[][] e = new double[n][];
            Map<Field, double[][]> values = new EnumMap<>(Field.class);
            for (Field fl : batch.fields()) {
                values.put(fl, new double[n][]);
            }
            for (int s = 0; s < n; s++) {
                q[s] = batch.q(s).clone();
                e[s] = batch.e(s).clone();
                f.accept(q[s], e[s]);
                for (Field fl : batch.fields()) {
                    values.get(fl)[s] = batch.values(fl, s);
                }
            }
            target.accept(new SampleBatch(batch.firstSample(), q, e, values));
        };
    }

    @Test
    void correctEnsemblePasses() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        GaussianityCheck g = check(spec, table);
        EstimatorFixtures.run(spec, table, SEED, 0, N, g);
        GaussianityResult r = g.result(1e-6);
        // 32 Anderson-Darling + max correlation + 2 Mardia + pooled in the family; 32 KS besides.
        assertEquals(36, r.verdict().tests());
        assertEquals(68, r.tests().size());
        assertTrue(r.verdict().passed(), String.format("seed %d, N = %d: %s", SEED, N, r.verdict().method()));
        for (NormalityTest t : r.tests()) {
            assertTrue(t.inVerdict() == !t.kind().equals("kolmogorov-smirnov"), t.toString());
            assertTrue(t.adjustedP() >= t.pValue(), "Holm never lowers a p-value: " + t);
        }
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
    }

    @Test
    void varianceThreePercentHighIsRejected() throws Exception {
        // Pooled scale over the 54 unchosen modes × 2 quadratures × 2000 samples: ν = 216 000 values,
        // E[z] = 0.03·√(ν/2) ≈ 9.9 against a two-sided critical z ≈ 5.9 (α = 1e-6/36): a miss needs a 4σ
        // fluctuation, probability 3e-5 — so the amplitude is scaled by √1.03 and N = 4000 here
        // (E[z] ≈ 14, miss ≈ 1e-15).
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        GaussianityCheck g = check(spec, table);
        double s = Math.sqrt(1.03);
        EstimatorFixtures.run(spec, table, SEED, 0, 2 * N, tamper(g, (q, e) -> {
            for (int l = 0; l < q.length; l++) {
                q[l] *= s;
                e[l] *= s;
            }
        }));
        GaussianityResult r = g.result(1e-6);
        assertFalse(r.verdict().passed(), "seed " + SEED + ": " + r.verdict().method());
        NormalityTest pooled = r.tests().stream().filter(t -> t.kind().equals("pooled-scale")).findFirst().orElseThrow();
        assertTrue(pooled.statistic() > 10, "pooled z " + pooled);
    }

    @Test
    void nonGaussianOrCorrelatedModesAreRejected() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        int[] modes = check(spec, table).modes();
        int a = modes[3];
        int b = modes[7];
        // Mode a's e mapped through the normal distribution function onto a uniform of the same
        // variance, σ√3(2Φ(e/σ) − 1): at n = 2000, A² ≈ 25 (p ~ 1e-13), far below α/K.
        GaussianityCheck g1 = check(spec, table);
        double sigma = Math.sqrt(table.variance(Field.E, a));
        EstimatorFixtures.run(spec, table, SEED, 0, N, tamper(g1, (q, e) ->
            e[a] = sigma * Math.sqrt(3) * (Erf.erfc(-e[a] / sigma / Math.sqrt(2)) - 1)));
        GaussianityResult r1 = g1.result(1e-6);
        assertFalse(r1.verdict().passed(), "non-Gaussian mode, seed " + SEED + ": " + r1.verdict().method());
        // Mode b's q made 0.3-correlated with mode a's q: r√n ≈ 13σ against a Bonferroni t of ~6.
        GaussianityCheck g2 = check(spec, table);
        double ra = Math.sqrt(table.variance(Field.A, b) / table.variance(Field.A, a));
        EstimatorFixtures.run(spec, table, SEED, 0, N, tamper(g2, (q, e) ->
            q[b] = Math.sqrt(1 - 0.09) * q[b] + 0.3 * ra * q[a]));
        GaussianityResult r2 = g2.result(1e-6);
        assertFalse(r2.verdict().passed(), "correlated modes, seed " + SEED + ": " + r2.verdict().method());
        NormalityTest mc = r2.tests().stream().filter(t -> t.kind().equals("max-correlation")).findFirst().orElseThrow();
        assertTrue(mc.statistic() > 0.2 && mc.subject().contains("mode " + a) && mc.subject().contains("mode " + b), mc.toString());
    }

    @Test
    void holmAdjustsAWorkedExample() {
        // Holm (1979): sorted p = 0.005, 0.01, 0.03, 0.04 → 4·0.005, 3·0.01, 2·0.03, max(0.06, 0.04).
        assertArrayEquals(new double[] {0.03, 0.06, 0.06, 0.02},
            GaussianityCheck.holm(new double[] {0.01, 0.04, 0.03, 0.005}), 1e-15);
        assertThrows(IllegalArgumentException.class, () -> GaussianityCheck.of(EstimatorFixtures.table(
            EstimatorFixtures.spec(Path.of("."))), Field.E, List.of(), List.of(), 0, 100));
    }
}
