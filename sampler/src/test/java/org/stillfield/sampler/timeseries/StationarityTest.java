package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;

/**
 * A lossy trajectory started from the Wigner draw stays in the stationary (vacuum or thermal)
 * state: at every step each amplitude has the variance the sampler draws and q, e are uncorrelated
 * (PHYSICS.md §2, §5; exact for the discretisation x' = ρRx + √(1−ρ²)σξ, since ρ²σ² + (1−ρ²)σ² = σ²).
 */
class StationarityTest {
    private static final long SEED = 20260501L;

    @Test
    void varianceIsTheThermalVarianceAtEveryStep() throws IOException {
        // Six modes of the 3x2x4 cm box, thermal at 0.3 K (coth factors 2.1 to 1.7), Q = 5 so that
        // κ dt ≈ 1 to 1.5 per step: after a few steps the state is set by the step noise alone, so a
        // wrong noise variance shows up at once (e.g. 1 − ρ in place of 1 − ρ² would settle at 0.76 σ²,
        // 10 standard errors off here).
        ThermalState state = new ThermalState(0.3);
        ModeTable t = Fixtures.table(10, state);
        ModeDamping damping = ModeDamping.of(t, LossModel.constant(5));
        int samples = 4000;
        int steps = 40;
        TimeGrid grid = new TimeGrid(1.3e-10, steps);
        int m = t.size();
        double[][] sumQ2 = new double[steps][m];
        double[][] sumE2 = new double[steps][m];
        double[][] sumQE = new double[steps][m];
        TimeSeriesSink sink = b -> {
            for (int s = 0; s < b.steps(); s++) {
                int n = b.firstStep() + s;
                for (int l = 0; l < m; l++) {
                    double q = b.q(s, l);
                    double e = b.e(s, l);
                    sumQ2[n][l] += q * q;
                    sumE2[n][l] += e * e;
                    sumQE[n][l] += q * e;
                }
            }
        };
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, damping, grid, List.of(), SEED, 0, samples, 2)
            .withAmplitudes(true), sink, null);

        // Known mean 0: S·s²/σ² ~ χ²_S exactly for a Gaussian amplitude. Bonferroni over
        // 2·steps·modes = 480 variance checks and 240 covariance checks with a test budget of 1e-6
        // false failures: each variance check at two-sided α = 1e-6/720.
        int checks = 3 * steps * m;
        double alpha = 1e-6 / checks;
        ChiSquaredDistribution chi2 = new ChiSquaredDistribution(samples);
        double lo = chi2.inverseCumulativeProbability(alpha / 2) / samples;
        double hi = chi2.inverseCumulativeProbability(1 - alpha / 2) / samples;
        // q·e has mean 0 and variance σ_q²σ_e² (Isserlis, zero covariance); the mean of S draws is
        // normal to O(S^{-1/2}) in skewness-free form, z bound at the same α.
        double z = new NormalDistribution().inverseCumulativeProbability(1 - alpha / 2);
        for (int n = 0; n < steps; n++) {
            for (int l = 0; l < m; l++) {
                double vq = t.variance(Field.A, l);
                double ve = t.variance(Field.E, l);
                double rq = sumQ2[n][l] / samples / vq;
                double re = sumE2[n][l] / samples / ve;
                String where = " (seed " + SEED + ", S = " + samples + ", step " + n + ", mode "
                    + t.modes().get(l).label() + ", band [" + lo + ", " + hi + "])";
                assertTrue(rq >= lo && rq <= hi, "var(q)/σ_A² = " + rq + where);
                assertTrue(re >= lo && re <= hi, "var(e)/σ_E² = " + re + where);
                double cqe = sumQE[n][l] / samples / Math.sqrt(vq * ve);
                assertTrue(Math.abs(cqe) <= z / Math.sqrt(samples), "corr(q, e) = " + cqe + where);
            }
        }
    }
}
