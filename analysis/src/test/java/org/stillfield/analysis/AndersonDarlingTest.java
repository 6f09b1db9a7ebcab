package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

/**
 * Anderson–Darling case 0: the limiting distribution against REFERENCE-VALUES.md §8 (Imhof
 * inversion and 2e6-draw Monte Carlo there; the classic table is slightly low, pitfall 7), its
 * moments, the statistic against a direct evaluation, and the p-values of finite samples.
 *
 * <p>False-failure budget: 1e-6 for the p-value uniformity check (KS at p ≥ 1e-6).
 */
class AndersonDarlingTest {
    @Test
    void limitingLawHasTheReferencePercentagePoints() {
        // REFERENCE-VALUES.md §8: 1.6212 / 1.9330 / 2.4924 / 3.0775 / 3.8781 (±1e-4) at 15/10/5/2.5/1 %.
        double[] z = {1.6212, 1.9330, 2.4924, 3.0775, 3.8781};
        double[] p = {0.15, 0.10, 0.05, 0.025, 0.01};
        for (int k = 0; k < z.length; k++) {
            assertEquals(z[k], AndersonDarling.criticalValue(p[k]), 1.5e-4, "critical value at " + p[k]);
        }
        // The classic table's 1 % point 3.857 lies in the tail beyond 1 % (pitfall 7).
        assertTrue(AndersonDarling.pValue(3.857) > 0.0102, "p at the classic 1 % point: " + AndersonDarling.pValue(3.857));
    }

    @Test
    void limitingLawHasMeanOneAndVarianceTwoPiSquaredOverThreeLessSix() {
        // A² = Σ χ²_1/(j(j+1)): mean Σ 1/(j(j+1)) = 1, variance 2Σ 1/(j(j+1))² = 2(π²/3 − 3)
        // (REFERENCE-VALUES.md §8). Moments from the distribution function: E = ∫(1 − F), E[A⁴]… here
        // E[(A²)²] = 2∫ z (1 − F(z)) dz, by the trapezoid rule on [0, 40].
        double h = 0.002;
        double m1 = 0;
        double m2 = 0;
        for (int k = 0; k <= 20_000; k++) {
            double z = k * h;
            double w = (k == 0 || k == 20_000) ? 0.5 : 1.0;
            double tail = AndersonDarling.pValue(z);
            m1 += w * h * tail;
            m2 += w * h * 2 * z * tail;
        }
        assertEquals(1.0, m1, 1e-5, "mean");
        assertEquals(2 * (Math.PI * Math.PI / 3 - 3), m2 - m1 * m1, 1e-4, "variance");
    }

    @Test
    void statisticMatchesTheDefinitionEvaluatedDirectly() {
        double[] x = {0.3, -1.2, 2.5, 0.01, -0.4, 1.1, -2.9, 0.7};
        double[] s = x.clone();
        Arrays.sort(s);
        NormalDistribution nd = new NormalDistribution(null, 0, 1);
        int n = s.length;
        double sum = 0;
        for (int i = 1; i <= n; i++) {
            sum += (2 * i - 1) * (Math.log(nd.cumulativeProbability(s[i - 1]))
                + Math.log(1 - nd.cumulativeProbability(s[n - i])));
        }
        assertEquals(-n - sum / n, AndersonDarling.statistic(x), 1e-12);
        assertThrows(IllegalArgumentException.class, () -> AndersonDarling.statistic(new double[] {Double.NaN}));
    }

    @Test
    void pValuesOfNormalSamplesAreUniformAndNonNormalSamplesAreRejected() {
        // 4000 samples of n = 200 standard normals: the p-values from the limiting law must be
        // uniform (KS p ≥ 1e-6), i.e. the finite-n correction is negligible at this n.
        long seed = 4242L;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        int reps = 4000;
        double[] p = new double[reps];
        double[] x = new double[200];
        for (int r = 0; r < reps; r++) {
            for (int i = 0; i < x.length; i++) {
                x[i] = g.sample();
            }
            p[r] = AndersonDarling.pValue(AndersonDarling.statistic(x));
        }
        var ks = AmplitudeCheck.ksTest();
        double d = ks.kolmogorovSmirnovStatistic(new UniformRealDistribution(null, 0, 1), p);
        double pk = 1 - ks.cdf(d, reps, false);
        assertTrue(pk >= 1e-6, String.format("seed %d, %d x n = 200: KS D = %.4f, p = %.3g", seed, reps, d, pk));
        // Power: uniform data with unit variance (√3·U(−1,1)) at n = 2000 give A² far in the tail.
        double[] u = new double[2000];
        for (int i = 0; i < u.length; i++) {
            u[i] = Math.sqrt(3) * (2 * rng.nextDouble() - 1);
        }
        double a2 = AndersonDarling.statistic(u);
        assertTrue(AndersonDarling.pValue(a2) < 1e-6, "uniform data must be rejected: A^2 = " + a2);
    }
}
