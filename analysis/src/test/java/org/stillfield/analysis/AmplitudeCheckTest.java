package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.Map;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.AmplitudeCheckResult;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;

/** The pooled case-0 KS check of standardised amplitudes (REFERENCE-VALUES.md §8). */
class AmplitudeCheckTest {
    private static final long SEED = 7_000_003L;

    @Test
    void correctAmplitudesPass() throws IOException {
        // 2000 samples x 70 modes x (q, e) = 280 000 amplitudes, pooled subset ≤ 20 000. A correct
        // sampler fails with probability α = 2e-6 (the module's share of the suite budget, see
        // CorrelationEstimatorTest).
        ModeTable table = EnsembleFixtures.tinyTable();
        AmplitudeCheck check = new AmplitudeCheck(table);
        EnsembleFixtures.run(table, SEED, 0, 2000, check);
        AmplitudeCheckResult r = check.result(2e-6);
        assertTrue(r.values() > AmplitudeCheck.DEFAULT_MAX_VALUES / 2 && r.values() <= AmplitudeCheck.DEFAULT_MAX_VALUES,
            "subset size " + r.values());
        assertTrue(r.verdict().passed(), String.format("seed %d, n = %d: D = %.5f, p = %.3g", SEED, r.values(),
            r.statistic(), r.pValue()));
    }

    @Test
    void amplitudesTenPercentTooWideAreRejected() throws IOException {
        // Power: q and e scaled by 1.1. The KS distance of N(0, 1.21) from N(0,1) is
        // Φ(x/1.1) − Φ(x) at x² = 2 ln 1.1/(1 − 1/1.21), i.e. D = 0.0231; with ~1.4e5 pooled values
        // √n·D ≈ 8.6 against the critical √n·D* ≈ 2.6 at α = 2e-6: a miss is far below 1e-6.
        ModeTable table = EnsembleFixtures.tinyTable();
        AmplitudeCheck check = new AmplitudeCheck(table, 200_000);
        EnsembleFixtures.run(table, SEED, 0, 2000, EnsembleFixtures.scaled(check, 1.0, 1.1));
        AmplitudeCheckResult r = check.result(2e-6);
        assertFalse(r.verdict().passed(), String.format("seed %d, n = %d: D = %.5f, p = %.3g", SEED, r.values(),
            r.statistic(), r.pValue()));
        assertEquals(0.0231, r.statistic(), 0.006, "D should be near its population value");
    }

    @Test
    void criticalDistancesMatchTheExactTables() {
        // Exact KS critical values D_n at α = 0.10 / 0.05 / 0.01 (REFERENCE-VALUES.md §8:
        // Simard & L'Ecuyer's algorithm behind scipy.stats.kstwo, source from memory):
        // n = 100: 0.12066 / 0.13403 / 0.16081; n = 1000: 0.03853 / 0.04278 / 0.05129.
        // Tolerance 1e-5: the table's 5 decimals (Pelz–Good is accurate far beyond that at n = 1000).
        KolmogorovSmirnovTest ks = AmplitudeCheck.ksTest();
        double[] alphas = {0.10, 0.05, 0.01};
        double[] n100 = {0.12066, 0.13403, 0.16081};
        double[] n1000 = {0.03853, 0.04278, 0.05129};
        for (int k = 0; k < 3; k++) {
            assertEquals(n100[k], AmplitudeCheck.criticalD(ks, 100, alphas[k]), 1e-5, "n = 100, alpha = " + alphas[k]);
            assertEquals(n1000[k], AmplitudeCheck.criticalD(ks, 1000, alphas[k]), 1e-5, "n = 1000, alpha = " + alphas[k]);
        }
    }

    @Test
    void subsetSpreadsOverSamplesModesAndBothAmplitudes() {
        // Feed known values: q of mode l in sample s is σ_q·(s + l/1000), e is −σ_e·(s + l/1000), so
        // each kept standardised value names its origin. The kept subset must cover the whole run:
        // with a well-mixed hash each amplitude is kept with the same probability, so about half the
        // kept values come from the later half of the samples and half are e values (binomial, n ≈
        // 2000 kept: 10 σ = 0.11 either way). Also: the same input gives the same subset.
        ModeTable table = EnsembleFixtures.tinyTable();
        int m = table.size();
        int samples = 1000;
        AmplitudeCheck a = new AmplitudeCheck(table, 2000);
        AmplitudeCheck b = new AmplitudeCheck(table, 2000);
        for (int s = 0; s < samples; s++) {
            double[][] q = new double[1][m];
            double[][] e = new double[1][m];
            for (int l = 0; l < m; l++) {
                q[0][l] = Math.sqrt(table.variance(Field.A, l)) * (s + l / 1000.0);
                e[0][l] = -Math.sqrt(table.variance(Field.E, l)) * (s + l / 1000.0);
            }
            SampleBatch batch = new SampleBatch(s, q, e, Map.of());
            a.accept(batch);
            b.accept(batch);
        }
        assertEquals(2L * m * samples, a.offered());
        double[] v = a.values();
        assertArrayEquals(v, b.values());
        assertTrue(v.length > 1000 && v.length <= 2000, "kept " + v.length);
        int late = 0;
        int fromE = 0;
        int highModes = 0;
        for (double x : v) {
            double code = Math.abs(x);
            int sample = (int) Math.floor(code + 1e-9);
            int mode = (int) Math.round((code - sample) * 1000);
            late += sample >= samples / 2 ? 1 : 0;
            fromE += Math.copySign(1.0, x) < 0 ? 1 : 0;
            highModes += mode >= m / 2 ? 1 : 0;
        }
        assertEquals(0.5, (double) late / v.length, 0.11, "share from the later samples");
        assertEquals(0.5, (double) fromE / v.length, 0.11, "share of e values");
        assertEquals(0.5, (double) highModes / v.length, 0.11, "share from the upper half of the modes");
    }

    @Test
    void rejectsBadArguments() {
        ModeTable table = EnsembleFixtures.tinyTable();
        assertThrows(IllegalArgumentException.class, () -> new AmplitudeCheck(table, 1));
        AmplitudeCheck c = new AmplitudeCheck(table);
        assertThrows(IllegalStateException.class, () -> c.result(0.01));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> c.result(0));
        assertTrue(ex.getMessage().contains("falseAlarm"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
            () -> c.accept(new SampleBatch(0, new double[1][3], new double[1][3], Map.of())));
        assertTrue(ex.getMessage().contains("70 modes"), ex.getMessage());
    }
}
