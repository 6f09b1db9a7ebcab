package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.SeriesAssembler;
import org.stillfield.sampler.timeseries.TimeGrid;
import org.stillfield.sampler.timeseries.TimeSeriesRunner;

class TwoTimeCorrelationTest {
    private static final long SEED = 31415L;

    /**
     * Ensemble two-time correlation of probe signals against PHYSICS.md §5,
     * C_xy(τ) = Σ_l σ_l² e^{−κ_l|τ|/2}[A_l cos ω_lτ + B_l sin ω_lτ] ({@link ProbeNoiseModel}).
     * Six modes of the 3x2x4 cm box up to 10 GHz, thermal 0.5 K, alternately lossless and Q = 30; a dipole
     * (couples to e) and a loop flux (couples to q); 20 000 samples, origin t = 0 only, lags 0…40 steps of
     * 17 ps (4 to 7 periods; e^{−κτ/2} down to 0.55).
     *
     * <p>Tolerance from the standard error of a known-mean product average of jointly Gaussian variables
     * (Isserlis): Var[x(τ) y(0)] = C_xx(0) C_yy(0) + C_xy(τ)² (REFERENCE-VALUES.md §8). Budget 1e-6 for the
     * test, Bonferroni over 3 × 41 lags: z = 5.6.
     */
    @Test
    void ensembleCorrelationMatchesTheModeSum() throws IOException {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 10e9, Window.DEFAULT_TOLERANCE),
            new ThermalState(0.5), 100);
        double[] q = new double[t.size()];
        for (int l = 0; l < q.length; l++) {
            q[l] = l % 2 == 0 ? Double.POSITIVE_INFINITY : 30;
        }
        ModeDamping d = ModeDamping.of(t, q, "test");
        List<Probe> probes = List.of(
            new Probe.ElectricDipole("pin", new Vec3(0.0112, 0.0063, 0.0137), new Vec3(0.2, 1, 0.6), 0.004),
            new Probe.MagneticLoop("loop", new Vec3(0.0071, 0.0144, 0.0255), new Vec3(0.5, 0.3, 1), 2e-6,
                Probe.LoopOutput.FLUX));
        ProbeCoefficients x = probes.get(0).coefficients(t);
        ProbeCoefficients y = probes.get(1).coefficients(t);
        int lags = 40;
        int samples = 20_000;
        double dt = 1.7e-11;
        TwoTimeCorrelation xx = TwoTimeCorrelation.of(lags, dt, TwoTimeCorrelation.Origins.FIRST);
        TwoTimeCorrelation xy = TwoTimeCorrelation.of(lags, dt, TwoTimeCorrelation.Origins.FIRST);
        TwoTimeCorrelation yx = TwoTimeCorrelation.of(lags, dt, TwoTimeCorrelation.Origins.FIRST);
        SeriesAssembler sink = new SeriesAssembler(new int[] {0, 1}, lags + 1, (s, v) -> {
            xx.add(v[0], v[0]);
            xy.add(v[0], v[1]);
            yx.add(v[1], v[0]);
        });
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, d, new TimeGrid(dt, lags + 1), probes, SEED, 0, samples, 2),
            sink, null);
        ProbeNoiseModel mxx = ProbeNoiseModel.of(t, d, x, x);
        ProbeNoiseModel mxy = ProbeNoiseModel.of(t, d, x, y);
        ProbeNoiseModel myx = ProbeNoiseModel.of(t, d, y, x);
        ProbeNoiseModel myy = ProbeNoiseModel.of(t, d, y, y);
        double z = new NormalDistribution().inverseCumulativeProbability(1 - 1e-6 / (2 * 3 * (lags + 1)));
        double vx = mxx.covariance();
        double vy = myy.covariance();
        double[] lagT = xx.lags();
        check("xx", xx.mean(), mxx, lagT, vx * vx, samples, z);
        check("xy", xy.mean(), mxy, lagT, vx * vy, samples, z);
        check("yx", yx.mean(), myx, lagT, vx * vy, samples, z);
        // The mixed correlation is not even in τ: C_xy(τ) = C_yx(−τ), and its sin part is what makes
        // the two differ (B_l ≠ 0 for a probe on e against one on q).
        assertTrue(Math.abs(mxy.correlation(5 * dt) - myx.correlation(5 * dt)) > 0.1 * Math.sqrt(vx * vy));
        assertEquals(mxy.correlation(5 * dt), myx.correlation(-5 * dt), 1e-12 * Math.sqrt(vx * vy));
        // The estimator's own standard error agrees with the Isserlis value (to its ~0.5 % sampling error;
        // 10 % allowed).
        double se0 = xx.standardError()[0];
        assertEquals(Math.sqrt(2 * vx * vx / samples), se0, 0.1 * se0);
    }

    private static void check(String what, double[] est, ProbeNoiseModel m, double[] lags, double prodVar,
                              int samples, double z) {
        for (int j = 0; j < est.length; j++) {
            double c = m.correlation(lags[j]);
            double se = Math.sqrt((prodVar + c * c) / samples);
            assertEquals(c, est[j], z * se, what + " at lag " + j + " (seed " + SEED + ", S = " + samples + ", SE " + se
                + ")");
        }
    }

    @Test
    void allOriginsAverageAgreesForAStationaryEnsemble() throws IOException {
        // Lossless and lossy trajectories started from the Wigner draw are stationary (the draw is isotropic
        // in (ωq, e), PHYSICS.md §2), so origins along the series may be pooled. SE from the spread over the
        // 600 independent samples (valid whatever the correlation along a series); budget 1e-6 over 31 lags.
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.GAUSS, 2 * Math.PI * 8e9, 1e-4),
            ThermalState.VACUUM, 1000);
        ModeDamping d = ModeDamping.of(t, org.stillfield.sampler.timeseries.LossModel.constant(50));
        List<Probe> probes = List.of(new Probe.FieldProbe("Ey", org.stillfield.sampler.api.Field.E,
            new Vec3(0.013, 0.011, 0.017), 1));
        ProbeCoefficients x = probes.get(0).coefficients(t);
        int lags = 30;
        double dt = 2.3e-11;
        TwoTimeCorrelation all = TwoTimeCorrelation.of(lags, dt, TwoTimeCorrelation.Origins.ALL);
        SeriesAssembler sink = new SeriesAssembler(new int[] {0}, 400, (s, v) -> all.add(v[0], v[0]));
        int samples = 600;
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, d, new TimeGrid(dt, 400), probes, SEED + 1, 0, samples, 2),
            sink, null);
        ProbeNoiseModel m = ProbeNoiseModel.of(t, d, x, x);
        double z = new NormalDistribution().inverseCumulativeProbability(1 - 1e-6 / (2 * (lags + 1)));
        double[] mean = all.mean();
        double[] se = all.standardError();
        for (int j = 0; j <= lags; j++) {
            assertEquals(m.correlation(j * dt), mean[j], z * se[j], "lag " + j + " (seed " + (SEED + 1) + ")");
        }
    }

    @Test
    void rejectsBadInput() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> TwoTimeCorrelation.of(-1, 1, TwoTimeCorrelation.Origins.ALL));
        assertTrue(ex.getMessage().contains("max lag") && ex.getMessage().contains("-1"), ex.getMessage());
        TwoTimeCorrelation c = TwoTimeCorrelation.of(5, 1, TwoTimeCorrelation.Origins.FIRST);
        ex = assertThrows(IllegalArgumentException.class, () -> c.add(new double[5], new double[5]));
        assertTrue(ex.getMessage().contains("too short"), ex.getMessage());
        c.add(new double[6], new double[6]);
        assertThrows(IllegalStateException.class, c::standardError);
    }
}
