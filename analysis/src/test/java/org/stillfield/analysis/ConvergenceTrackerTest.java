package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.ConvergencePoint;
import org.stillfield.analysis.api.ConvergenceResult;
import org.stillfield.sampler.api.ModeTable;

/**
 * Error against sample count over 20 independent replicate ensembles of the 70-mode box: N·rms² has
 * expectation exactly 1 at every prefix (each normalised error has variance 1/N, Isserlis), and the
 * log–log slope is −1/2; an ensemble with 5 % too much variance flattens the curve.
 *
 * <p>False-failure budget: 1e-6, Bonferroni over the 7 prefixes and the slope (t with 19 degrees
 * of freedom from the replicate spread).
 */
class ConvergenceTrackerTest {
    private static final int REPS = 20;
    private static final long N = 3200;

    private static ConvergenceResult one(ModeTable table, long seed, double fieldScale) throws Exception {
        ConvergenceTracker t = ConvergenceTracker.of(EnsembleFixtures.PAIRS, EnsembleFixtures.FIELDS, 4,
            ConvergenceTracker.doubling(N));
        EnsembleFixtures.run(table, seed, 0, N, EnsembleFixtures.scaled(t, fieldScale, 1.0));
        return t.result(table, EnsembleFixtures.POINTS);
    }

    @Test
    void errorFallsAsOneOverRootN() throws Exception {
        ModeTable table = EnsembleFixtures.tinyTable();
        assertArrayEquals(new long[] {50, 100, 200, 400, 800, 1600, 3200}, ConvergenceTracker.doubling(N));
        int k = 7;
        double[][] nrms2 = new double[k][REPS];
        double[] slopes = new double[REPS];
        for (int r = 0; r < REPS; r++) {
            ConvergenceResult res = one(table, 5_000 + r, 1.0);
            assertEquals(k, res.points().size());
            for (int c = 0; c < k; c++) {
                ConvergencePoint p = res.points().get(c);
                nrms2[c][r] = p.samples() * p.rmsError() * p.rmsError();
                assertEquals(1 / Math.sqrt(p.samples()), p.expected(), 1e-15);
            }
            slopes[r] = res.slope();
        }
        double tStar = new TDistribution(null, REPS - 1).inverseCumulativeProbability(1 - 1e-6 / 16);
        for (int c = 0; c < k; c++) {
            double[] ms = meanSe(nrms2[c]);
            assertTrue(Math.abs(ms[0] - 1) < tStar * ms[1], String.format("seeds 5000..5019, prefix %d: mean N rms^2 ="
                + " %.4f +- %.4f, expected 1 (critical t %.2f)", c, ms[0], ms[1], tStar));
        }
        double[] s = meanSe(slopes);
        assertTrue(Math.abs(s[0] + 0.5) < tStar * s[1], String.format("slope %.4f +- %.4f, expected -0.5", s[0], s[1]));
        // Power: 5 % excess variance adds a bias of ≈ 0.035 s₁ on the diagonal rows, comparable to the
        // 1/√N = 0.018 noise at N = 3200, so the last prefix sits far above the line (N·rms² ≈ 2 instead
        // of 1, > 20 replicate standard errors) and the slope flattens.
        ConvergenceResult biased = one(table, 5_000, Math.sqrt(1.05));
        double last = N * Math.pow(biased.points().get(k - 1).rmsError(), 2);
        double[] ms = meanSe(nrms2[k - 1]);
        assertTrue(last > ms[0] + 10 * ms[1] && biased.slope() > s[0], String.format(
            "biased ensemble: N rms^2 = %.3f (unbiased %.3f +- %.3f), slope %.3f", last, ms[0], ms[1], biased.slope()));
        assertThrows(IllegalArgumentException.class, () -> ConvergenceTracker.of(EnsembleFixtures.PAIRS,
            EnsembleFixtures.FIELDS, 4, new long[] {10, 10}));
        assertThrows(IllegalArgumentException.class, () -> ConvergenceTracker.of(List.of(), EnsembleFixtures.FIELDS,
            4, new long[] {10, 20}));
    }

    private static double[] meanSe(double[] x) {
        double m = 0;
        for (double v : x) {
            m += v / x.length;
        }
        double var = 0;
        for (double v : x) {
            var += (v - m) * (v - m) / (x.length - 1);
        }
        return new double[] {m, Math.sqrt(var / x.length)};
    }
}
