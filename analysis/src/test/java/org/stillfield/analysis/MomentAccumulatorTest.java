package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

/**
 * The mergeable moment accumulator against a direct two-pass computation (an independent
 * algorithm: mean first, then Σ (x − x̄)(x − x̄)ᵀ in one loop over all data).
 */
class MomentAccumulatorTest {
    private static final long SEED = 99L;

    private static double[][] data(int n, int p, double offset) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(SEED);
        double[][] x = new double[n][p];
        for (int s = 0; s < n; s++) {
            for (int k = 0; k < p; k++) {
                // A large common offset makes naive one-pass sums lose digits; Chan's update must not.
                x[s][k] = offset + (k + 1) * (rng.nextDouble() - 0.5) + 0.3 * x[s][0];
            }
        }
        return x;
    }

    private static double[][] slice(double[][] x, int from, int to) {
        double[][] out = new double[to - from][];
        System.arraycopy(x, from, out, 0, to - from);
        return out;
    }

    @Test
    void partsMergedEqualTheUnionAndTheTwoPassResult() {
        // Chan, Golub & LeVeque (1979/1983, source from memory): merging exact parts is exact
        // algebra, so only rounding separates the merged result from the direct one.
        int n = 1000;
        int p = 7;
        double[][] x = data(n, p, 1e3);
        MomentAccumulator whole = MomentAccumulator.of(p);
        whole.addAll(x, n);
        int[] cuts = {0, 1, 2, 250, 251, 700, 1000};
        MomentAccumulator merged = MomentAccumulator.of(p);
        for (int c = 0; c + 1 < cuts.length; c++) {
            MomentAccumulator part = MomentAccumulator.of(p);
            double[][] s = slice(x, cuts[c], cuts[c + 1]);
            if (s.length == 1) {
                part.add(s[0]);
            } else {
                part.addAll(s, s.length);
            }
            merged.merge(part);
        }
        merged.merge(MomentAccumulator.of(p));
        double[] mean = new double[p];
        for (double[] row : x) {
            for (int k = 0; k < p; k++) {
                mean[k] += row[k] / n;
            }
        }
        double[] com = new double[p * p];
        double[] raw = new double[p * p];
        for (double[] row : x) {
            for (int i = 0; i < p; i++) {
                for (int j = 0; j < p; j++) {
                    com[i * p + j] += (row[i] - mean[i]) * (row[j] - mean[j]);
                    raw[i * p + j] += row[i] * row[j] / n;
                }
            }
        }
        assertEquals(n, merged.count());
        double dm = EstimatorFixtures.relativeDifference(merged.mean(), whole.mean());
        double dc = EstimatorFixtures.relativeDifference(merged.comoment(), whole.comoment());
        assertTrue(dm < 1e-12 && dc < 1e-12, "merged vs whole: mean " + dm + ", co-moment " + dc);
        assertTrue(EstimatorFixtures.relativeDifference(whole.mean(), mean) < 1e-12, "mean vs two-pass");
        // The co-moment is ~1e-6 of the squared offset: the direct sum above is itself accurate
        // only to ~1e-10 relative here, so that is the tolerance.
        assertTrue(EstimatorFixtures.relativeDifference(whole.comoment(), com) < 1e-10, "co-moment vs two-pass");
        assertTrue(EstimatorFixtures.relativeDifference(whole.secondMoment(), raw) < 1e-12, "raw moment");
        double[] cov = whole.covariance();
        assertEquals(com[p + 1] / (n - 1), cov[p + 1], 1e-10 * Math.abs(cov[p + 1]), "covariance divides by n - 1");
    }

    @Test
    void mergeIsSymmetricInThePartsToRounding() {
        double[][] x = data(300, 4, 0.0);
        MomentAccumulator a = MomentAccumulator.of(4);
        MomentAccumulator b = MomentAccumulator.of(4);
        a.addAll(slice(x, 0, 100), 100);
        b.addAll(slice(x, 100, 300), 200);
        MomentAccumulator ab = a.copy();
        ab.merge(b);
        MomentAccumulator ba = b.copy();
        ba.merge(a);
        assertTrue(EstimatorFixtures.relativeDifference(ab.comoment(), ba.comoment()) < 1e-14);
        assertEquals(100, a.count(), "merge must not change its argument");
    }

    @Test
    void refusesADimensionAboveTheLimitWithTheMemoryItWouldTake() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> MomentAccumulator.of(5000));
        assertTrue(ex.getMessage().contains("3072") && ex.getMessage().contains("5000") && ex.getMessage().contains("MiB"),
            ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> MomentAccumulator.of(10, 9000));
        assertThrows(IllegalArgumentException.class, () -> MomentAccumulator.of(0));
        MomentAccumulator m = MomentAccumulator.of(2);
        assertThrows(IllegalArgumentException.class, () -> m.add(new double[] {1, Double.NaN}));
        assertThrows(IllegalArgumentException.class, () -> m.merge(m));
        assertThrows(IllegalStateException.class, m::secondMoment);
    }
}
